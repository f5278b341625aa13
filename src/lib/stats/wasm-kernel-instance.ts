/**
 * The WebAssembly kernels of the numerical core (graphical lasso, Householder reduction, plane
 * rotations, positive-definite kernels) each run as one instance per thread, made on first use
 * from the module's bytes, importing a memory of its own (`env.memory`) that grows when a larger
 * order needs it. Module state is per thread (each worker thread loads its own copy), so the
 * cache below is too. The centred cross-products kernel is left out on purpose: its function
 * must stay self-contained (centered-products-kernel.ts).
 * References: WebAssembly Core Specification 2.0 (2022), §4.2.8 (memory instances and growth).
 */

/** Bytes per WebAssembly memory page. */
export const WASM_PAGE_BYTES = 65_536;

/** The most a WebAssembly memory can hold: 65,536 pages, 4 GiB. */
export const WASM_MAX_BYTES = 2 ** 32;

/** A kernel's instance and its memory. */
export interface WasmKernelInstance {
  readonly memory: WebAssembly.Memory;
  readonly exports: WebAssembly.Exports;
}

const instances = new Map<Uint8Array<ArrayBuffer>, WasmKernelInstance>();

/**
 * This thread's instance of a kernel module, its memory grown to hold at least `byteLength`
 * bytes. Growing detaches the views of the old buffer: take views afresh after each call.
 * @param module The module's bytes (the same array each call: it is the cache's key).
 * @param byteLength Bytes the caller needs in the memory (the caller checks its own limit first).
 * @returns The instance (memory and exports).
 * References: none (caching and memory growth).
 */
export function wasmKernelInstance(module: Uint8Array<ArrayBuffer>, byteLength: number): WasmKernelInstance {
  const pages = Math.max(1, Math.ceil(byteLength / WASM_PAGE_BYTES));
  let kernel = instances.get(module);
  if (kernel === undefined) {
    const memory = new WebAssembly.Memory({ initial: pages });
    kernel = { memory, exports: new WebAssembly.Instance(new WebAssembly.Module(module), { env: { memory } }).exports };
    instances.set(module, kernel);
  }
  const present = kernel.memory.buffer.byteLength / WASM_PAGE_BYTES;
  if (pages > present) kernel.memory.grow(pages - present);
  return kernel;
}
