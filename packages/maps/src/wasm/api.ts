/**
 * The parts of the WebAssembly JavaScript API that umbra's generated modules use (the FFT kernels,
 * the FITS byte swap). The project's TypeScript libraries declare no WebAssembly values, so they
 * are declared once here.
 */

/** Module compilation, instantiation and memories (WebAssembly JavaScript Interface, W3C 2022). */
export interface WasmApi {
  validate(bytes: Uint8Array): boolean;
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports?: Record<string, Record<string, unknown>>) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number; maximum?: number }) => { buffer: ArrayBuffer };
}

/** This runtime's WebAssembly API, or undefined where there is none (callers then fall back to JavaScript). */
export const wasmApi: WasmApi | undefined = (globalThis as unknown as { WebAssembly?: WasmApi }).WebAssembly;
