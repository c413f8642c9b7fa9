import fc from 'fast-check';

/**
 * Random utterance-like strings from a mix of scripts and the characters that break naive
 * tokenisers. Units are whole strings, so a ZWJ sequence or flag can arrive intact, while lone
 * marks, joiners and surrogates also arrive on their own and combine with their neighbours.
 */
const ascii = ['fix', 'leak', 'a', 'Tap', '9', '11am', '555', '-', '.', ',', '?', "'", '$', '(', ')', '/', ':'];
const emoji = [
  '🚰', '💧', '🔧', '👍🏽', '👨‍🔧', '👩🏾‍🔧', '🏳️‍🌈', '🇬🇧', '🇫🇷', '🇬', '❤️', '1️⃣', '🏴󠁧󠁢󠁥󠁮󠁧󠁿',
];
const marks = ['\u0301', '\u0308', 'e\u0301', '\u0651', '\u05B4', '\u093F', '\u20E3'];
const arabic = ['سباك', 'ب', 'الثلاثاء', '\u0660\u0661', '،', 'ـ'];
const hebrew = ['שלום', 'א', 'אינסטלטור', '״', '׳'];
const cjk = ['水', '管', '修理', '明日', 'ひ', 'カタ', '한국', '。', '，'];
/** Every one is Unicode White_Space (PropList.txt). */
export const whitespaceUnits = [' ', '  ', '\t', '\n', '\r\n', '\u00A0', '\u3000', '\u202F', '\u2009', '\u0085', '\u2028'];
/** Default_Ignorable_Code_Point, invisible: LRM, RLM, ZWJ, ZWNJ, ZWSP, soft hyphen, BOM. */
export const invisibleUnits = ['\u200E', '\u200F', '\u200D', '\u200C', '\u200B', '\u00AD', '\uFEFF'];
const loneSurrogates = ['\uD83D', '\uDE00'];

const unit = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom(...ascii) },
  { weight: 3, arbitrary: fc.constantFrom(...whitespaceUnits) },
  { weight: 2, arbitrary: fc.constantFrom(...emoji) },
  { weight: 2, arbitrary: fc.constantFrom(...marks) },
  { weight: 2, arbitrary: fc.constantFrom(...arabic) },
  { weight: 2, arbitrary: fc.constantFrom(...hebrew) },
  { weight: 2, arbitrary: fc.constantFrom(...cjk) },
  { weight: 1, arbitrary: fc.constantFrom(...invisibleUnits) },
  { weight: 1, arbitrary: fc.constantFrom(...loneSurrogates) },
);

export const textArbitrary = fc.string({ unit, maxLength: 24 });

/** The same mix without standalone invisible characters or lone surrogates: well-formed visible text. */
export const visibleTextArbitrary = fc.string({
  unit: fc.oneof(
    { weight: 4, arbitrary: fc.constantFrom(...ascii) },
    { weight: 3, arbitrary: fc.constantFrom(...whitespaceUnits) },
    { weight: 2, arbitrary: fc.constantFrom(...emoji, ...marks, ...arabic, ...hebrew, ...cjk) },
  ),
  maxLength: 24,
});
