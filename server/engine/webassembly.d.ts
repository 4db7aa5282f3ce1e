// The part of the WebAssembly JavaScript API the engine's SIMD kernels use (W3C
// "WebAssembly JavaScript Interface", sections Module, Instance, Memory, validate).
// Node has these globals, but @types/node 20 does not declare them and the server's
// tsconfig leaves out the DOM library, which is where TypeScript keeps them.
declare namespace WebAssembly {
  type BufferSource = ArrayBufferView | ArrayBuffer;
  type ImportValue = Memory | number | ((...args: never[]) => unknown);
  type Imports = Record<string, Record<string, ImportValue>>;
  type Exports = Record<string, unknown>;

  interface MemoryDescriptor {
    initial: number;
    maximum?: number;
    shared?: boolean;
  }

  class Module {
    constructor(bytes: BufferSource);
  }

  class Instance {
    constructor(module: Module, importObject?: Imports);
    readonly exports: Exports;
  }

  class Memory {
    constructor(descriptor: MemoryDescriptor);
    readonly buffer: ArrayBuffer | SharedArrayBuffer;
    grow(delta: number): number;
  }

  function validate(bytes: BufferSource): boolean;
}
