/** Dense integer ids for strings, so the n-gram passes hash numbers instead of strings. */
export class StringInterner {
  private readonly ids = new Map<string, number>();
  readonly values: string[] = [];

  id(value: string): number {
    let id = this.ids.get(value);
    if (id === undefined) {
      id = this.values.length;
      this.ids.set(value, id);
      this.values.push(value);
    }
    return id;
  }

  get size(): number {
    return this.values.length;
  }
}

/**
 * Dense ids for pairs of non-negative int32s, in an open-addressing table over typed arrays: the
 * n-gram passes intern millions of pairs, and a Map of numbers spends most of that time hashing and
 * collecting garbage. `capacity` is an upper bound on the distinct pairs (the table never grows).
 */
export class PairInterner {
  private readonly firsts: Int32Array;
  private readonly seconds: Int32Array;
  private readonly slots: Int32Array;
  private readonly mask: number;
  private count = 0;

  constructor(capacity: number) {
    let size = 16;
    while (size < capacity * 2) size *= 2;
    this.mask = size - 1;
    this.slots = new Int32Array(size).fill(-1);
    this.firsts = new Int32Array(size);
    this.seconds = new Int32Array(size);
  }

  id(a: number, b: number): number {
    // Multiplicative mixing constants from MurmurHash3's finaliser (from memory).
    let h = Math.imul(a ^ Math.imul(b, 0x85ebca6b), 0xc2b2ae35);
    h ^= h >>> 16;
    let slot = h & this.mask;
    for (;;) {
      const id = this.slots[slot] ?? -1;
      if (id < 0) {
        if (this.count * 2 >= this.slots.length) throw new RangeError('PairInterner: capacity exceeded');
        this.slots[slot] = this.count;
        this.firsts[slot] = a;
        this.seconds[slot] = b;
        return this.count++;
      }
      if (this.firsts[slot] === a && this.seconds[slot] === b) return id;
      slot = (slot + 1) & this.mask;
    }
  }

  get size(): number {
    return this.count;
  }
}
