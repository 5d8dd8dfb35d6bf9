import { describe, it, expect } from "vitest";
import { InputError } from "../src/errors.js";

describe("InputError", () => {
  it("names the file, key and pixel in its message", () => {
    const e = new InputError("expected a positive number, found -1", { file: "a.yaml", key: "psf.fwhmArcsec" });
    expect(e.message).toBe("a.yaml, key psf.fwhmArcsec: expected a positive number, found -1");
  });
});
