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
 * Dense ids for pairs (a, b) with b < base: the pair is packed into one number, exact while
 * a·base + b stays below 2^53, which holds for any corpus that fits in memory.
 */
export class PairInterner {
  private readonly ids = new Map<number, number>();

  constructor(private readonly base: number) {}

  id(a: number, b: number): number {
    const packed = a * this.base + b;
    let id = this.ids.get(packed);
    if (id === undefined) {
      id = this.ids.size;
      this.ids.set(packed, id);
    }
    return id;
  }

  get size(): number {
    return this.ids.size;
  }
}
