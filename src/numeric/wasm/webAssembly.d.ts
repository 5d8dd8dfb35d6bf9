/**
 * The part of the WebAssembly JavaScript interface (W3C WebAssembly JavaScript Interface 2.0)
 * that arcsift uses. Node provides the global; TypeScript declares it only with the DOM library,
 * which this project does not load.
 */
declare namespace WebAssembly {
  class Module {
    constructor(bytes: Uint8Array);
  }
  class Memory {
    constructor(descriptor: { initial: number; maximum?: number });
    readonly buffer: ArrayBuffer;
    grow(pages: number): number;
  }
  class Instance {
    constructor(module: Module, imports: Record<string, Record<string, unknown>>);
    readonly exports: Record<string, unknown>;
  }
  function validate(bytes: Uint8Array): boolean;
}
