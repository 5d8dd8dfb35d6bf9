/** The value after `--name` in a benchmark's arguments, or undefined when the option is absent. */
export function benchOption(args: readonly string[], name: string): string | undefined {
  const at = args.indexOf(name);
  return at >= 0 ? args[at + 1] : undefined;
}

/** A whole-number option >= minimum, `fallback` when absent; anything else is an error naming the option. */
export function wholeNumberOption(args: readonly string[], name: string, fallback: number, minimum = 1): number {
  const text = benchOption(args, name);
  if (text === undefined) return fallback;
  const value = Number(text);
  if (!(Number.isInteger(value) && value >= minimum)) throw new Error(`${name}: expected a whole number >= ${minimum}, found ${text}`);
  return value;
}
