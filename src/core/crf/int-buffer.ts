/** A growable Int32Array (doubling), so encoding a corpus never goes through boxed number arrays. */
export class IntBuffer {
  data: Int32Array;
  length = 0;

  constructor(capacity = 1024) {
    this.data = new Int32Array(Math.max(16, capacity));
  }

  push(value: number): void {
    if (this.length === this.data.length) {
      const grown = new Int32Array(this.data.length * 2);
      grown.set(this.data);
      this.data = grown;
    }
    this.data[this.length++] = value;
  }

  pushAll(values: Int32Array): void {
    const needed = this.length + values.length;
    if (needed > this.data.length) {
      const grown = new Int32Array(Math.max(needed, this.data.length * 2));
      grown.set(this.data.subarray(0, this.length));
      this.data = grown;
    }
    this.data.set(values, this.length);
    this.length = needed;
  }

  toArray(): Int32Array {
    return this.data.slice(0, this.length);
  }
}
