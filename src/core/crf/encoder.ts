import { attributeAt, CRF_SPAN as SPAN, CRF_WINDOW, wordTemplates } from './attributes';
import type { IntBuffer } from './int-buffer';

const WORD_CACHE_LIMIT = 200_000;

/**
 * Interns attribute strings to dense ids and caches, per distinct word, the ids it contributes at
 * each window offset: a corpus repeats words heavily, so each token costs one map lookup and a few
 * copies instead of dozens of string builds. While growing (training) unknown attributes get new
 * ids; once frozen (tagging) they are dropped, as a model has no weights for them anyway.
 */
export class AttributeEncoder {
  readonly names: string[];
  private readonly ids = new Map<string, number>();
  private readonly words = new Map<string, Int32Array[]>();
  /** Per window place k (offset k − CRF_WINDOW): the attribute ids a token gets there when that place is before the start / past the end. */
  readonly bos: Int32Array[] = [];
  readonly eos: Int32Array[] = [];
  readonly bias: Int32Array;
  private growing: boolean;
  constructor(names: readonly string[] = [], growing = true) {
    this.names = [...names];
    this.names.forEach((name, id) => this.ids.set(name, id));
    this.growing = growing;
    this.bias = this.idsOf(['bias']);
    for (let offset = -CRF_WINDOW; offset <= CRF_WINDOW; offset++) {
      this.bos.push(this.idsOf(offset < 0 ? [attributeAt('BOS', offset)] : []));
      this.eos.push(this.idsOf(offset > 0 ? [attributeAt('EOS', offset)] : []));
    }
  }

  get size(): number {
    return this.names.length;
  }

  /** Stop adding attributes; words cached while growing stay valid since their ids all exist. */
  freeze(): void {
    this.growing = false;
  }

  id(name: string): number {
    const known = this.ids.get(name);
    if (known !== undefined) return known;
    if (!this.growing) return -1;
    const id = this.names.length;
    this.names.push(name);
    this.ids.set(name, id);
    return id;
  }

  private idsOf(names: readonly string[]): Int32Array {
    const out: number[] = [];
    for (const name of names) {
      const id = this.id(name);
      if (id >= 0) out.push(id);
    }
    return Int32Array.from(out);
  }

  /** The attribute ids `word` gives a token at each window place k (offset k − CRF_WINDOW), not cached. */
  wordIdsFresh(word: string): Int32Array[] {
    const templates = wordTemplates(word);
    const out: Int32Array[] = [];
    for (let offset = -CRF_WINDOW; offset <= CRF_WINDOW; offset++) out.push(this.idsOf(templates.map((template) => attributeAt(template, offset))));
    return out;
  }

  /** As `wordIdsFresh`, cached per word. */
  wordIds(word: string): Int32Array[] {
    let cached = this.words.get(word);
    if (cached === undefined) {
      // Rare words (phone numbers, references) would grow the cache without bound over a large corpus.
      if (this.words.size >= WORD_CACHE_LIMIT) this.words.clear();
      cached = this.wordIdsFresh(word);
      this.words.set(word, cached);
    }
    return cached;
  }

  /**
   * Append each token's attribute ids to `ids` and each token's end position to `ends`
   * (so a flat corpus is `ends` as offsets into `ids`).
   */
  encode(words: readonly string[], ids: IntBuffer, ends: IntBuffer): void {
    const perWord = words.map((word) => this.wordIds(word));
    for (let t = 0; t < words.length; t++) {
      ids.pushAll(this.bias);
      for (let k = 0; k < SPAN; k++) {
        const at = t + k - CRF_WINDOW;
        const part = at < 0 ? this.bos[k] : at >= words.length ? this.eos[k] : perWord[at]?.[k];
        if (part !== undefined) ids.pushAll(part);
      }
      ends.push(ids.length);
    }
  }
}
