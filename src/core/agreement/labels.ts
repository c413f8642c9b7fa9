import { tagParse } from '../schemes';

/** Interns strings to small ints in order of first sight; `sorted` renumbers them by name. */
export class LabelInterner {
  private readonly codes = new Map<string, number>();
  readonly names: string[] = [];

  constructor(private readonly first: number) {}

  code(name: string): number {
    let code = this.codes.get(name);
    if (code === undefined) {
      code = this.first + this.names.length;
      this.codes.set(name, code);
      this.names.push(name);
    }
    return code;
  }

  /** Sorted names (code-unit order, so the result does not depend on the locale) and old -> new code. */
  sorted(): { names: string[]; remap: Int32Array } {
    const names = [...this.names].sort();
    const position = new Map(names.map((name, i) => [name, i + this.first]));
    const remap = new Int32Array(this.first + this.names.length);
    for (let i = 0; i < this.first; i++) remap[i] = i;
    this.names.forEach((name, i) => {
      remap[i + this.first] = position.get(name) ?? 0;
    });
    return { names, remap };
  }
}

/** Prefix kinds of raw tags; unparseable tags read as O, as `spansFromTags` reads them. */
export const RawPrefix = { O: 0, B: 1, I: 2, E: 3, S: 4 } as const;
export type RawPrefix = (typeof RawPrefix)[keyof typeof RawPrefix];

const PREFIX_KIND: Record<string, RawPrefix> = { B: RawPrefix.B, I: RawPrefix.I, E: RawPrefix.E, S: RawPrefix.S };

/** Raw tag strings (any scheme) -> code, with each code's prefix kind and slot code. */
export class RawTagTable {
  private readonly codes = new Map<string, number>();
  readonly prefix: RawPrefix[] = [];
  readonly slot: number[] = [];

  constructor(private readonly slots: LabelInterner) {}

  code(tag: string): number {
    let code = this.codes.get(tag);
    if (code === undefined) {
      code = this.prefix.length;
      this.codes.set(tag, code);
      const parsed = tagParse(tag);
      if (parsed === null || parsed.prefix === 'O') {
        this.prefix.push(RawPrefix.O);
        this.slot.push(0);
      } else {
        this.prefix.push(PREFIX_KIND[parsed.prefix] ?? RawPrefix.O);
        this.slot.push(this.slots.code(parsed.slot));
      }
    }
    return code;
  }
}
