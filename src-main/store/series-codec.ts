import { endianness } from 'node:os';

/**
 * The blob form of a price series (see migration 1): little-endian typed arrays. Every platform
 * Holdfast ships on is little-endian; a big-endian host is refused rather than misread.
 */
if (endianness() !== 'LE') throw new Error('Holdfast stores need a little-endian machine');

export interface SeriesArrays {
  days: Int32Array;
  closes: Float64Array;
  batches: Int32Array;
}

export function toBlob(array: Int32Array | Float64Array): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

export function int32s(blob: Buffer): Int32Array {
  if (blob.byteOffset % 4 === 0) return new Int32Array(blob.buffer, blob.byteOffset, blob.byteLength / 4);
  return new Int32Array(blob.buffer.slice(blob.byteOffset, blob.byteOffset + blob.byteLength));
}

export function float64s(blob: Buffer): Float64Array {
  if (blob.byteOffset % 8 === 0) return new Float64Array(blob.buffer, blob.byteOffset, blob.byteLength / 8);
  return new Float64Array(blob.buffer.slice(blob.byteOffset, blob.byteOffset + blob.byteLength));
}

export interface MergeResult extends SeriesArrays {
  added: number;
  replaced: number;
}

/**
 * Sets the points `days`/`closes` (ascending) into `base`, tagging new or changed values with
 * `batch`. A point equal to the stored close keeps its original batch.
 */
export function mergeSeries(
  base: SeriesArrays | undefined,
  days: Int32Array,
  closes: ArrayLike<number>,
  batch: number,
): MergeResult {
  const bd = base?.days ?? new Int32Array(0);
  const bc = base?.closes ?? new Float64Array(0);
  const bb = base?.batches ?? new Int32Array(0);
  const n = bd.length + days.length;
  const outDays = new Int32Array(n);
  const outCloses = new Float64Array(n);
  const outBatches = new Int32Array(n);
  let i = 0;
  let j = 0;
  let k = 0;
  let added = 0;
  let replaced = 0;
  while (i < bd.length || j < days.length) {
    if (j >= days.length || (i < bd.length && bd[i] < days[j])) {
      outDays[k] = bd[i];
      outCloses[k] = bc[i];
      outBatches[k++] = bb[i++];
    } else if (i >= bd.length || days[j] < bd[i]) {
      outDays[k] = days[j];
      outCloses[k] = closes[j++];
      outBatches[k++] = batch;
      added++;
    } else {
      outDays[k] = days[j];
      const changed = !Object.is(bc[i], closes[j]);
      outCloses[k] = changed ? closes[j] : bc[i];
      outBatches[k++] = changed ? batch : bb[i];
      if (changed) replaced++;
      i++;
      j++;
    }
  }
  return {
    days: outDays.subarray(0, k),
    closes: outCloses.subarray(0, k),
    batches: outBatches.subarray(0, k),
    added,
    replaced,
  };
}

/** Index of the first element >= `value` in an ascending array. */
export function lowerBound(array: Int32Array, value: number): number {
  let lo = 0;
  let hi = array.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (array[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
