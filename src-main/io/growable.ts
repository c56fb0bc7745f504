/** Append-only typed arrays that double as they fill (a column of a price file being read). */
export class GrowableFloat64 {
  private data = new Float64Array(256);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  view(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}

export class GrowableInt32 {
  private data = new Int32Array(256);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  view(): Int32Array {
    return this.data.subarray(0, this.length);
  }
}
