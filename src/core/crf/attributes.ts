/**
 * Token attributes for the tagger: identity, lower case, word shape, prefixes and suffixes, digit and
 * punctuation flags, for the token and its neighbours within two places, plus sentence-edge markers
 * (the window-of-two template set is common practice for slot filling and chunking, no source).
 * Every attribute is a string `template=value@offset`; the names are part of the model format.
 */

/** Names the attribute templates below; a model trained with another set is refused. */
export const CRF_FEATURE_SET = 'slotsmith-window2/1';

export const CRF_WINDOW = 2;
/** Window places per token: offsets −CRF_WINDOW … +CRF_WINDOW. */
export const CRF_SPAN = 2 * CRF_WINDOW + 1;

const OFFSET_NAMES = ['-2', '-1', '0', '+1', '+2'];

function charClass(code: number, char: string): string {
  if (code >= 48 && code <= 57) return 'd';
  const lower = char.toLowerCase();
  const upper = char.toUpperCase();
  if (lower !== upper) return char === upper ? 'X' : 'x';
  return char;
}

/** `Drain-42` → `Xxxxx-dd`: upper X, lower x, digit d, anything else kept. */
export function wordShape(word: string): string {
  let shape = '';
  for (const char of word) shape += charClass(char.codePointAt(0) ?? 0, char);
  return shape;
}

/** Runs of one class collapsed: `Xxxxx-dd` → `Xx-d`. */
export function wordShapeShort(shape: string): string {
  let short = '';
  let last = '';
  for (const char of shape) {
    if (char !== last) short += char;
    last = char;
  }
  return short;
}

const LETTER_OR_DIGIT = /[\p{L}\p{N}]/u;

/** The templates of one word, without offset. Flags appear only when true. */
export function wordTemplates(word: string): string[] {
  const lower = word.toLowerCase();
  const shape = wordShape(word);
  const chars = [...lower];
  // Identity beside lower case only when case makes them differ: a second, always-equal copy adds work, not information.
  const out = word === lower ? [`l=${lower}`] : [`w=${word}`, `l=${lower}`];
  out.push(`sh=${shape}`, `ss=${wordShapeShort(shape)}`);
  for (let k = 1; k <= 3 && k <= chars.length; k++) {
    out.push(`p${k}=${chars.slice(0, k).join('')}`, `s${k}=${chars.slice(-k).join('')}`);
  }
  if (/^\p{N}+$/u.test(word)) out.push('digits');
  else if (/\p{N}/u.test(word)) out.push('hasdigit');
  if (!LETTER_OR_DIGIT.test(word)) out.push('punct');
  else if (shape.startsWith('X') && !shape.slice(1).includes('X')) out.push('title');
  else if (!shape.includes('x') && shape.includes('X')) out.push('upper');
  return out;
}

export function attributeAt(template: string, offset: number): string {
  return `${template}@${OFFSET_NAMES[offset + CRF_WINDOW] ?? String(offset)}`;
}

/** Attribute strings of every token of an utterance (the readable form; the tagger uses `AttributeEncoder`). */
export function attributesOfWords(words: readonly string[]): string[][] {
  const templates = words.map(wordTemplates);
  return words.map((_, t) => {
    const out = ['bias'];
    for (let offset = -CRF_WINDOW; offset <= CRF_WINDOW; offset++) {
      const at = t + offset;
      if (at < 0) out.push(attributeAt('BOS', offset));
      else if (at >= words.length) out.push(attributeAt('EOS', offset));
      else for (const template of templates[at] ?? []) out.push(attributeAt(template, offset));
    }
    return out;
  });
}
