/** Growable typed arrays; sized up front when the caller knows the size (big buffers trigger full GCs). */
export class IntGrow {
  data: Int32Array;
  length = 0;

  constructor(capacity: number) {
    this.data = new Int32Array(Math.max(capacity, 16));
  }

  reserve(extra: number): void {
    if (this.length + extra <= this.data.length) return;
    const grown = new Int32Array(Math.max(this.data.length * 2, this.length + extra));
    grown.set(this.data.subarray(0, this.length));
    this.data = grown;
  }

  push(value: number): void {
    this.reserve(1);
    this.data[this.length++] = value;
  }

  done(): Int32Array {
    return this.length === this.data.length ? this.data : this.data.slice(0, this.length);
  }
}

export class FloatGrow {
  data: Float64Array;
  length = 0;

  constructor(capacity: number) {
    this.data = new Float64Array(Math.max(capacity, 16));
  }

  reserve(extra: number): void {
    if (this.length + extra <= this.data.length) return;
    const grown = new Float64Array(Math.max(this.data.length * 2, this.length + extra));
    grown.set(this.data.subarray(0, this.length));
    this.data = grown;
  }

  push(value: number): void {
    this.reserve(1);
    this.data[this.length++] = value;
  }

  done(): Float64Array {
    return this.length === this.data.length ? this.data : this.data.slice(0, this.length);
  }
}
