// Append-only typed-array columns, so that a day of passes costs a few megabytes and no per-pass objects.

/** A growable Float64 column. */
export class F64Column {
  private buf = new Float64Array(1024);
  length = 0;

  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = new Float64Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }

  at(i: number): number {
    return this.buf[i]!;
  }

  /** A view of the filled part (shares memory; valid until the next push). */
  view(): Float64Array {
    return this.buf.subarray(0, this.length);
  }
}

/** A growable Int32 column. */
export class I32Column {
  private buf = new Int32Array(1024);
  length = 0;

  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = new Int32Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }

  at(i: number): number {
    return this.buf[i]!;
  }

  view(): Int32Array {
    return this.buf.subarray(0, this.length);
  }
}
