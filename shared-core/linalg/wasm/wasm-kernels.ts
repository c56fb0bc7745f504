import { kernelTeam } from '../kernel-team.js';
import { KERNEL_MODULE_BASE64, KERNEL_SHARED_MODULE_BASE64 } from './kernel-binary.js';

/**
 * The dense kernels compiled to WebAssembly with SIMD (the C sources beside this file, built by
 * scripts/build-wasm.mjs into kernel-binary.ts). Each kernel makes the same sums in the same order
 * as its TypeScript twin, which stays as the fallback: where WebAssembly or its SIMD is missing,
 * or the module will not compile (a page's main thread refuses to compile synchronously), every
 * kernel runs in TypeScript and the answer is the same bit for bit (the tests check both).
 *
 * Two builds of the same sources: one on a memory of its own, and one on a shared memory for the
 * command line's kernel team (kernel-team.ts), whose helper thread runs its own instance on the
 * team's memory, so both threads' shares work on the same arrays in place.
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
  /** tridiagonal.c: the reduction's first reflector, from row n - 1 of w (n x n); state = [h, ready]. */
  tridiagonal_begin(w: number, n: number, v: number, e: number, state: number): void;
  /**
   * tridiagonal.c: the reduction's steps from, from - 1, ..., down to but not including `to`, as
   * the loop of tridiagonalForm in tridiagonal-form.ts. Pointers are byte offsets.
   */
  tridiagonal_steps(
    w: number,
    n: number,
    u: number,
    q: number,
    v: number,
    p: number,
    p2: number,
    e: number,
    halfNorms: number,
    state: number,
    from: number,
    to: number,
  ): void;
  /** tridiagonal.c: step i up to its pass; the pass's split, or -1 where the step has none. */
  tridiagonal_step_to_pass(
    w: number,
    n: number,
    i: number,
    u: number,
    q: number,
    v: number,
    p: number,
    e: number,
    halfNorms: number,
    state: number,
  ): number;
  /** tridiagonal.c: a pass's first column range [0, split) of the leading m x m block into p. */
  tridiagonal_pass_mine: PassRange;
  /** tridiagonal.c: a pass's second column range [split, m) into p (p2), zeroed first. */
  tridiagonal_pass_share: PassRange;
  /** tridiagonal.c: the end of a step's pass, p[split..m) += p2[split..m). */
  tridiagonal_pass_end(p: number, p2: number, split: number, m: number, state: number): void;
  /**
   * tridiagonal.c: eigenvalues [l0, l1) of the implicit QL iteration on d, e (shifted down by one),
   * rotating `tracked` too when `track` is 1; state = [f, tst1]. 0 done, 1 the TypeScript must
   * make it (an entry outside the plain hypot's range, or NaN), 2 not converged.
   */
  tridiagonal_ql(
    d: number,
    e: number,
    tracked: number,
    track: number,
    n: number,
    l0: number,
    l1: number,
    state: number,
  ): number;
  /**
   * cholesky.c: columns [j0, j1) of L on the block's own rows, each pair's pivot rows left side by
   * side in `pairs` (j1 - j0 times n doubles); 1 when every pivot is positive and finite, else 0.
   */
  cholesky_diagonal_block(a: number, n: number, j0: number, j1: number, pairs: number): number;
  /** cholesky.c: columns [j0, j1) of L on rows [r0, r1) below the block, from its `pairs`. */
  cholesky_rows_below(a: number, n: number, j0: number, j1: number, r0: number, r1: number, pairs: number): void;
  /** cholesky.c: L y = b on rows [i0, i1) of b, the sums from column `first` (forwardSubstitute). */
  cholesky_forward_rows(l: number, n: number, b: number, first: number, i0: number, i1: number): void;
  /** cholesky.c: L' x = y on rows i1 - 1 down to i0 of b (backSubstituteTransposed). */
  cholesky_back_rows(l: number, n: number, b: number, i0: number, i1: number): void;
}

/** A column range of one pass of the tridiagonal reduction (tridiagonal.c); pointers are byte offsets. */
type PassRange = (w: number, n: number, m: number, split: number, u: number, q: number, v: number, p: number) => void;

export interface WasmKernels {
  readonly exports: KernelExports;
  /** True on the kernel team's shared memory: views may then be handed to the team's helper. */
  readonly shared: boolean;
  /**
   * Views of consecutive regions of the module's memory with these lengths in doubles, each at a
   * 16-byte boundary (a view's byteOffset is its pointer for the kernels). The memory grows when
   * needed, which invalidates earlier views of a memory of its own: take a kernel's views once,
   * after which nothing grows it until the kernel ends. The regions hold whatever the last
   * kernel left there.
   */
  views(...lengths: number[]): Float64Array[];
  /**
   * How many times views() has been called: a kernel that leaves its result in the memory for a
   * later one (the Cholesky factor for its solves) knows it is still there when no views were
   * taken since.
   */
  readonly viewsTaken: number;
}

/**
 * The language's WebAssembly object (ECMAScript engines in Node and in browsers alike), as much as
 * the loader uses: declared here because the core's types have neither the DOM nor Node.
 */
declare const WebAssembly: WebAssemblyApi | undefined;
interface WebAssemblyApi {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
  Memory: new (descriptor: { initial: number; maximum?: number; shared?: boolean }) => KernelMemory;
}

/** A WebAssembly.Memory. */
export interface KernelMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}

const PAGE_BYTES = 65536;
/** The shared build's declared maximum (2 GiB, build-wasm.mjs): a shared memory must name it. */
const MAX_SHARED_PAGES = 32768;
/**
 * The helper thread's stack in a shared memory: the bytes just above the module's heap base, which
 * views therefore skip. The kernels keep only a few values on the stack.
 */
const HELPER_STACK_BYTES = 65536;

let enabled = true;
let own: WasmKernels | null | undefined;
let onTeamMemory: { memory: KernelMemory; kernels: WasmKernels | null } | undefined;
let helper: WasmKernels | null = null;

/**
 * The kernels this thread runs, instantiated at the first call: on the installed kernel team's
 * shared memory where there is one, else on a memory of their own; null where WebAssembly cannot
 * run them (or they are switched off).
 */
export function wasmKernels(): WasmKernels | null {
  if (!enabled) return null;
  if (helper) return helper;
  const memory = kernelTeam()?.memory as KernelMemory | null | undefined;
  if (memory) {
    if (onTeamMemory?.memory !== memory)
      onTeamMemory = { memory, kernels: instantiate(KERNEL_SHARED_MODULE_BASE64, memory, false) };
    if (onTeamMemory.kernels) return onTeamMemory.kernels;
  }
  if (own === undefined) own = ownMemory();
  return own;
}

/** Switches the WebAssembly kernels off (false) or back on: the tests compare both paths. */
export function useWasmKernels(on: boolean): void {
  enabled = on;
}

/** A shared memory for a kernel team and its helper, or null where the engine cannot share one. */
export function sharedKernelMemory(): KernelMemory | null {
  if (typeof WebAssembly === 'undefined') return null;
  try {
    return new WebAssembly.Memory({ initial: 2, maximum: MAX_SHARED_PAGES, shared: true });
  } catch {
    return null;
  }
}

/**
 * In a kernel team's helper thread: its kernels run on the team's shared memory, on a stack of
 * their own. False when the module cannot run there (the helper then makes TypeScript shares only).
 */
export function bindHelperKernels(memory: KernelMemory): boolean {
  helper = instantiate(KERNEL_SHARED_MODULE_BASE64, memory, true);
  return helper !== null;
}

/**
 * The kernels a helper's share of a WebAssembly kernel runs: those on the team's memory, or null
 * where they did not load (the share is then made in TypeScript on the same arrays). Never
 * wasmKernels(), whose fallback is a memory of the helper's own, where the share's pointers mean
 * nothing.
 */
export function helperKernels(): WasmKernels | null {
  return helper;
}

function ownMemory(): WasmKernels | null {
  if (typeof WebAssembly === 'undefined') return null;
  try {
    return instantiate(KERNEL_MODULE_BASE64, new WebAssembly.Memory({ initial: 2 }), false);
  } catch {
    return null;
  }
}

function instantiate(base64: string, memory: KernelMemory, asHelper: boolean): WasmKernels | null {
  if (typeof WebAssembly === 'undefined') return null;
  try {
    const module = new WebAssembly.Module(decodeBase64(base64));
    const instance = new WebAssembly.Instance(module, { env: { memory } });
    const heapBase = (instance.exports.__heap_base as { value: number }).value;
    const first = align16(heapBase) + HELPER_STACK_BYTES;
    if (asHelper) (instance.exports.__stack_pointer as { value: number }).value = first;
    let taken = 0;
    return {
      exports: instance.exports as unknown as KernelExports,
      shared: base64 === KERNEL_SHARED_MODULE_BASE64,
      get viewsTaken() {
        return taken;
      },
      views(...lengths: number[]): Float64Array[] {
        taken++;
        const offsets: number[] = [];
        let end = first;
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
