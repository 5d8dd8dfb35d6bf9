import { InputError, expectedFound } from '../errors.js';

/**
 * A value inside a config file together with where it sits (file and dotted key path), so
 * every validation message can name both. Reading a key marks it as known; `finish()` rejects
 * any key that was never read.
 */
export class ConfigNode {
  private readonly seen = new Set<string>();

  constructor(readonly value: unknown, readonly file: string, readonly key: string) {}

  fail(message: string, key: string = this.key): never {
    throw new InputError(message, { file: this.file, key: key === '' ? undefined : key });
  }

  private childKey(name: string | number): string {
    if (typeof name === 'number') return `${this.key}[${name}]`;
    return this.key === '' ? name : `${this.key}.${name}`;
  }

  isMapping(): boolean {
    return typeof this.value === 'object' && this.value !== null && !Array.isArray(this.value);
  }

  private mapping(): Record<string, unknown> {
    if (!this.isMapping()) this.fail(expectedFound('a mapping of keys', this.value));
    return this.value as Record<string, unknown>;
  }

  has(name: string): boolean {
    return Object.prototype.hasOwnProperty.call(this.mapping(), name);
  }

  /** The child at `name`; absent children have value undefined. */
  get(name: string): ConfigNode {
    const map = this.mapping();
    this.seen.add(name);
    return new ConfigNode(map[name], this.file, this.childKey(name));
  }

  keys(): string[] {
    return Object.keys(this.mapping());
  }

  list(): ConfigNode[] {
    if (!Array.isArray(this.value)) this.fail(expectedFound('a list', this.value));
    return (this.value as unknown[]).map((item, index) => new ConfigNode(item, this.file, this.childKey(index)));
  }

  /** Rejects keys of this mapping that were not read. */
  finish(): void {
    for (const name of this.keys()) {
      if (!this.seen.has(name)) {
        const known = [...this.seen].sort().join(', ');
        this.fail(`unknown key${known ? ` (known here: ${known})` : ''}`, this.childKey(name));
      }
    }
  }

  number(options: { min?: number; max?: number; exclusiveMin?: boolean; integer?: boolean } = {}): number {
    const v = this.value;
    const what = options.integer ? 'a whole number' : 'a number';
    if (typeof v !== 'number' || !Number.isFinite(v)) this.fail(expectedFound(what, v));
    if (options.integer && !Number.isInteger(v)) this.fail(expectedFound(what, v));
    if (options.min !== undefined) {
      const bad = options.exclusiveMin ? v <= options.min : v < options.min;
      if (bad) this.fail(expectedFound(`${what} ${options.exclusiveMin ? '>' : '>='} ${options.min}`, v));
    }
    if (options.max !== undefined && v > options.max) this.fail(expectedFound(`${what} <= ${options.max}`, v));
    return v;
  }

  optionalNumber(fallback: number, options: Parameters<ConfigNode['number']>[0] = {}): number {
    return this.value === undefined ? fallback : this.number(options);
  }

  string(): string {
    if (typeof this.value !== 'string') this.fail(expectedFound('a string', this.value));
    return this.value as string;
  }

  oneOf<T extends string>(choices: readonly T[]): T {
    const v = this.value;
    if (typeof v !== 'string' || !choices.includes(v as T)) {
      this.fail(expectedFound(`one of ${choices.join(', ')}`, v));
    }
    return v as T;
  }

  boolean(): boolean {
    if (typeof this.value !== 'boolean') this.fail(expectedFound('true or false', this.value));
    return this.value as boolean;
  }
}
