import { KERNEL_MODULE_BASE64 } from './kernel-binary.js';

/**
 * The dense kernels compiled to WebAssembly with SIMD (the C sources beside this file, built by
 * scripts/build-wasm.mjs into kernel-binary.ts). Each kernel makes the same sums in the same order
 * as its TypeScript twin, which stays as the fallback: where WebAssembly or its SIMD is missing,
 * or the module will not compile (a page's main thread refuses to compile synchronously), every
 * kernel runs in TypeScript and the answer is the same bit for bit (the tests check both).
 *
 * V8 runs a WebAssembly function first from its baseline compiler and uses the optimised code
 * only for later calls, so a caller splits its work into many calls (a panel, a block of
 * columns), never one call for the whole job: one call of the cross product at N = 500 ran at a
 * third of the optimised speed.
 */
export interface KernelExports {
  /** cross-product.c: row panel `rowPanel`'s blocks of X'X over periods [k0, k1). Pointers are byte offsets. */
  cross_product_row_panel(
    packed: number,
    out: number,
    t: number,
    n: number,
    rowPanel: number,
    k0: number,
    k1: number,
  ): void;
  /**
   * tridiagonal.c: columns [from, to) of one pass of the tridiagonal reduction over the leading
   * m x m block of w (n x n), as fusedColumns in tridiagonal-form.ts. Pointers are byte offsets.
   */
  tridiagonal_columns(
    w: number,
    n: number,
    m: number,
    from: number,
    to: number,
    u: number,
    q: number,
    v: number,
    p: number,
  ): void;
  /**
   * cholesky.c: columns [j0, j1) of L on the block's own rows, each pair's pivot rows left side by
   * side in `pairs` (j1 - j0 times n doubles); 1 when every pivot is positive and finite, else 0.
   */
  cholesky_diagonal_block(a: number, n: number, j0: number, j1: number, pairs: number): number;
  /** cholesky.c: columns [j0, j1) of L on rows [r0, r1) below the block, from its `pairs`. */
  cholesky_rows_below(a: number, n: number, j0: number, j1: number, r0: number, r1: number, pairs: number): void;
}

export interface WasmKernels {
  readonly exports: KernelExports;
  /**
   * Views of consecutive regions of the module's memory with these lengths in doubles, each at a
   * 16-byte boundary (a view's byteOffset is its pointer for the kernels). The memory grows when
   * needed, which invalidates earlier views: take a kernel's views once, after which nothing grows
   * it until the kernel ends. The regions hold whatever the last kernel left there.
   */
  views(...lengths: number[]): Float64Array[];
}

/**
 * The language's WebAssembly object (ECMAScript engines in Node and in browsers alike), as much as
 * the loader uses: declared here because the core's types have neither the DOM nor Node.
 */
declare const WebAssembly: WebAssemblyApi | undefined;
interface WebAssemblyApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer; grow(pages: number): number };
}

const PAGE_BYTES = 65536;

let enabled = true;
let loaded: WasmKernels | null | undefined;

/** The kernels' module, instantiated at the first call; null where it cannot run (or is switched off). */
export function wasmKernels(): WasmKernels | null {
  if (!enabled) return null;
  if (loaded === undefined) loaded = instantiate();
  return loaded;
}

/** Switches the WebAssembly kernels off (false) or back on: the tests compare both paths, the bench times both. */
export function useWasmKernels(on: boolean): void {
  enabled = on;
}

function instantiate(): WasmKernels | null {
  if (typeof WebAssembly === 'undefined') return null;
  const api = WebAssembly;
  try {
    const module = new api.Module(decodeBase64(KERNEL_MODULE_BASE64));
    const memory = new api.Memory({ initial: 2 });
    const instance = new api.Instance(module, { env: { memory } });
    const heapBase = (instance.exports.__heap_base as { value: number }).value;
    return {
      exports: instance.exports as unknown as KernelExports,
      views(...lengths: number[]): Float64Array[] {
        const offsets: number[] = [];
        let end = align16(heapBase);
        for (const length of lengths) {
          offsets.push(end);
          end = align16(end + length * 8);
        }
        const short = end - memory.buffer.byteLength;
        if (short > 0) memory.grow(Math.ceil(short / PAGE_BYTES));
        return lengths.map((length, k) => new Float64Array(memory.buffer, offsets[k], length));
      },
    };
  } catch {
    return null;
  }
}

function align16(bytes: number): number {
  return Math.ceil(bytes / 16) * 16;
}

const BASE64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

/** Standard base64 (RFC 4648, section 4) to bytes: the core has neither Buffer nor atob in its types. */
function decodeBase64(text: string): Uint8Array {
  const value = new Uint8Array(128);
  for (let k = 0; k < BASE64.length; k++) value[BASE64.charCodeAt(k)] = k;
  const body = text.replace(/=+$/, '');
  const bytes = new Uint8Array(Math.floor((body.length * 3) / 4));
  let bits = 0;
  let held = 0;
  let at = 0;
  for (let k = 0; k < body.length; k++) {
    bits = (bits << 6) | value[body.charCodeAt(k)];
    held += 6;
    if (held >= 8) {
      held -= 8;
      bytes[at++] = (bits >> held) & 0xff;
    }
  }
  return bytes;
}
