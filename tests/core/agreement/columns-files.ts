import fc from 'fast-check';

/*
 * Column files of invented home-repair utterances, most of them well formed, some with the faults
 * real files have: missing or unknown tags, tags outside the scheme, tokens missing from `# text`,
 * comments inside an utterance, CRLF line ends, blank lines of spaces, a BOM, -DOCSTART-.
 */
const TOKENS = ['fix', 'the', 'tap', 'día', '555-0142', 'boiler', 'tuesday', 'morning', 'x', '-DOCSTART-'];
const GOOD_TAGS = ['O', 'O', 'O', 'B-service', 'I-service', 'B-day', 'I-day', 'B-time_window', 'I-area'];
const ODD_TAGS = ['E-day', 'S-day', 'Q-day', 'B-', 'b-day'];

const tokenLine = fc
  .tuple(
    fc.constantFrom(...TOKENS),
    fc.constantFrom('\t', '\t', ' ', '  '),
    fc.oneof({ weight: 15, arbitrary: fc.constantFrom(...GOOD_TAGS) }, { weight: 1, arbitrary: fc.constantFrom(...ODD_TAGS) }),
    fc.constantFrom('', '', '', ' ', '\r'),
  )
  .map(([token, gap, tag, end]) => ({ token, line: `${token}${gap}${tag}${end}` }));
const oddLine = fc.constantFrom('lonely', '# note = inside', '\uFEFFfix\tO', 'fix\tO\tB-day').map((line) => ({ token: '', line }));

const block = fc
  .record({
    id: fc.option(fc.nat(40), { nil: undefined }),
    intent: fc.option(fc.constantFrom('book_visit', 'reschedule', 'ask_price'), { nil: undefined }),
    // `# text`: none, the tokens with extra spaces, or (rarely) one that misses them.
    text: fc.constantFrom('none', 'none', 'tokens', 'tokens', 'tokens', 'other'),
    meta: fc.boolean(),
    lines: fc.array(fc.oneof({ weight: 25, arbitrary: tokenLine }, { weight: 1, arbitrary: oddLine }), { minLength: 0, maxLength: 7 }),
  })
  .map(({ id, intent, text, meta, lines }) => {
    const head: string[] = [];
    if (id !== undefined) head.push(`# id = hr-${String(id).padStart(3, '0')}`);
    if (intent !== undefined) head.push(`# intent = ${intent}`);
    if (text === 'tokens') head.push(`# text = ${lines.map((l) => l.token).join('  ')} please`);
    if (text === 'other') head.push('# text = fix the boiler');
    if (meta) head.push('# source = visit-form');
    return [...head, ...lines.map((l) => l.line)].join('\n');
  });

/** A whole file: blocks apart by blank lines of several kinds, sometimes CRLF, BOM or no final newline. */
export const columnsFileArb: fc.Arbitrary<string> = fc
  .tuple(
    fc.array(fc.tuple(block, fc.constantFrom('\n\n', '\n\n', '\n\n', '\n\n\n', '\n\r\n', '\n \n', '\n\n\uFEFFfix\tO\n\n')), { minLength: 1, maxLength: 14 }),
    fc.boolean(),
    fc.boolean(),
    fc.boolean(),
  )
  .map(([blocks, bom, crlf, finalNewline]) => {
    let text = blocks.map(([b, gap]) => b + gap).join('');
    if (!finalNewline) text = text.replace(/\s+$/u, '');
    if (crlf) text = text.replace(/\n/gu, '\r\n');
    return bom ? `\uFEFF${text}` : text;
  });

/** Files with no faults at all: the shapes a split read must join back exactly. */
export const cleanColumnsFileArb: fc.Arbitrary<string> = fc
  .array(
    fc.record({
      id: fc.nat(1000),
      tags: fc.array(fc.constantFrom('O', 'B-service', 'I-service', 'B-day', 'I-day', 'I-area', 'B-budget'), { minLength: 1, maxLength: 6 }),
      intent: fc.option(fc.constantFrom('book_visit', 'cancel', 'check_status'), { nil: undefined }),
      withText: fc.boolean(),
      gap: fc.constantFrom('\n\n', '\n\r\n', '\n\n\n'),
    }),
    { minLength: 1, maxLength: 20 },
  )
  .map((blocks) =>
    blocks
      .map(({ id, tags, intent, withText, gap }, k) => {
        const tokens = tags.map((_, t) => TOKENS[(id + t) % 9] as string);
        const head = [`# id = hr-${String(k)}`];
        if (intent !== undefined) head.push(`# intent = ${intent}`);
        if (withText) head.push(`# text = ${tokens.join('  ')}`);
        return [...head, ...tokens.map((token, t) => `${token}\t${tags[t] ?? 'O'}`)].join('\n') + gap;
      })
      .join(''),
  );

/**
 * Where a piece may start (see the command line's `boundaryFind`): just after a blank line that is
 * LF LF or LF CR LF, not at the end, and not before U+FEFF. Offsets in UTF-16 code units.
 */
export function textBoundaries(text: string): number[] {
  const out: number[] = [];
  for (let i = 0; i < text.length; i++) {
    if (text[i] !== '\n') continue;
    let after = -1;
    if (text[i + 1] === '\n') after = i + 2;
    else if (text[i + 1] === '\r' && text[i + 2] === '\n') after = i + 3;
    if (after > 0 && after < text.length && text.charCodeAt(after) !== 0xfeff) out.push(after);
  }
  return out;
}
