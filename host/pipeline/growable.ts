// Append-only typed-array columns, so that a day of passes costs a few megabytes and no per-pass objects.

type Typed = Float64Array | Int32Array;

/** A growable typed-array column (doubling its buffer when full). */
class Column<T extends Typed> {
  private buf: T;
  length = 0;

  constructor(private readonly make: (n: number) => T) {
    this.buf = make(1024);
  }

  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = this.make(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }

  at(i: number): number {
    return this.buf[i]!;
  }

  /** A view of the filled part (shares memory; valid until the next push). */
  view(): T {
    return this.buf.subarray(0, this.length) as T;
  }
}

/** A growable Float64 column. */
export class F64Column extends Column<Float64Array> {
  constructor() {
    super((n) => new Float64Array(n));
  }
}

/** A growable Int32 column. */
export class I32Column extends Column<Int32Array> {
  constructor() {
    super((n) => new Int32Array(n));
  }
}
