export { InputError } from "./errors.js";
