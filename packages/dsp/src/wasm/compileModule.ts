/**
 * Compiling the package's WebAssembly modules from the base64 bytes it ships (scripts/assembleKernel.ts),
 * for the simulation's kernel (sim/wasm/wasmKernel.ts) and the analysis's loops
 * (analysis/wasm/analysisKernel.ts) alike. The engine's WebAssembly API is typed locally: the package
 * compiles under the browser's and Node's type libraries alike, and an engine without WebAssembly has none.
 */

/** An instance's exports, as the module that made it reads them. */
export interface WasmInstance<Exports> {
  readonly exports: Exports;
}

interface WasmApi {
  readonly Module: new (bytes: Uint8Array) => object;
  readonly Instance: new (module: object, imports: object) => WasmInstance<unknown>;
}

const wasmApi = (globalThis as unknown as { readonly WebAssembly?: WasmApi }).WebAssembly;

/** The compiled module, or null where it cannot be compiled (no WebAssembly, or a Content Security Policy without 'wasm-unsafe-eval'). */
export function compileModule(base64: string): object | null {
  if (!wasmApi) return null;
  try {
    const text = atob(base64);
    const bytes = new Uint8Array(text.length);
    for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
    return new wasmApi.Module(bytes);
  } catch {
    return null;
  }
}

/** A new instance of a compiled module. */
export function instantiate<Exports>(module: object, imports: object): WasmInstance<Exports> {
  return new wasmApi!.Instance(module, imports) as WasmInstance<Exports>;
}
