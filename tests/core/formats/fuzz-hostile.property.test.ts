/** Hostile cell and text content: spreadsheet formulas in CSV/TSV, lone surrogates in JSON Lines. */
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { cellFormulaEscape, cellFormulaUnescape, delimitedRead, delimitedWrite, jsonlRead, jsonlWrite } from '../../../src/core/formats';
import type { Utterance } from '../../../src/core/types';

const RUNS = { seed: 42, numRuns: 2_000 };
// OWASP "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells must not begin with these.
const TRIGGERS = ['=', '+', '-', '@', '\t', '\r'];

const cellArbitrary = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 12 }),
  fc.tuple(fc.constantFrom(...TRIGGERS, "'", "''", "'="), fc.string({ maxLength: 8 })).map(([a, b]) => a + b),
  fc.constantFrom('=HYPERLINK("http://example.invalid","x")', '=1+1', '+1 555-0142', '-2 degrees', '@SUM(A1)', "'=kept", "it's fine"),
);

function utterance(text: string, id: string, meta: Record<string, string>): Utterance {
  return { id, text, tokens: [], tags: [], meta };
}

describe('CSV/TSV formula escape', () => {
  it('escapes exactly the cells that start with a trigger (after any quotes), and undoes it exactly', () => {
    fc.assert(
      fc.property(cellArbitrary, (cell) => {
        const escaped = cellFormulaEscape(cell);
        const body = cell.replace(/^'+/, '');
        const risky = TRIGGERS.some((t) => body.startsWith(t));
        expect(escaped).toBe(risky ? `'${cell}` : cell);
        expect(TRIGGERS.some((t) => escaped.startsWith(t))).toBe(false);
        expect(cellFormulaUnescape(escaped)).toBe(cell);
      }),
      RUNS,
    );
  });

  it('no written cell starts a formula; our reader gets every value back', () => {
    const row = fc.record({ text: cellArbitrary.filter((t) => t.trim() !== ''), id: cellArbitrary, note: cellArbitrary });
    fc.assert(
      fc.property(fc.array(row, { minLength: 1, maxLength: 5 }), fc.constantFrom(',' as const, '\t' as const), (rows, delimiter) => {
        const list = rows.map((r, i) => utterance(r.text, r.id === '' ? `hr-${i}` : r.id, r.note === '' ? {} : { note: r.note }));
        const written = delimitedWrite(list, { delimiter });
        // Parse the file independently of our reader: every cell as a spreadsheet would see it.
        const cells = Papa.parse<string[]>(written.slice(0, -1), { delimiter, newline: '\n' }).data.flat();
        for (const cell of cells) expect(TRIGGERS.some((t) => cell.startsWith(t)), JSON.stringify(cell)).toBe(false);
        const doc = delimitedRead(written, { column: 'text', idColumn: 'id', delimiter, tokeniser: { kind: 'whitespace' } });
        expect(doc.errors).toEqual([]);
        expect(doc.utterances.map((u) => [u.text, u.id, u.meta])).toEqual(list.map((u) => [u.text, u.id, u.meta]));
      }),
      { seed: 42, numRuns: 500 },
    );
  });

  it('the escape shows as one leading quote; off on request, kept verbatim on request', () => {
    const list = [utterance('=1+1 for the boiler', 'hr-1', { note: '@ana' })];
    expect(delimitedWrite(list)).toBe("id,text,note\nhr-1,'=1+1 for the boiler,'@ana\n");
    expect(delimitedWrite(list, { formulaEscape: false })).toBe('id,text,note\nhr-1,=1+1 for the boiler,@ana\n');
    const raw = delimitedRead(delimitedWrite(list), { column: 'text', formulaUnescape: false });
    expect(raw.utterances[0]?.text).toBe("'=1+1 for the boiler");
    // A leading tab is quoted by RFC 4180 rules in TSV, and still escaped inside the quotes.
    expect(delimitedWrite([utterance('\tleak', 'hr-2', {})], { delimiter: '\t' })).toBe('id\ttext\nhr-2\t"\'\tleak"\n');
  });
});

describe('JSON Lines with lone surrogates', () => {
  it('JSON.stringify escapes a lone surrogate as \\uXXXX (ES2019 well-formed JSON.stringify), so every line is valid UTF-8', () => {
    // ECMAScript 2019, "Well-formed JSON.stringify" (tc39 proposal, now §25.5.2.3 QuoteJSONString).
    expect(JSON.stringify('\uD800')).toBe('"\\ud800"');
    expect(JSON.stringify('a\uDFFFb')).toBe('"a\\udfffb"');
  });

  it('texts, ids and meta with lone surrogates write as ASCII-safe JSON and read back unchanged', () => {
    const surrogate = fc.integer({ min: 0xd800, max: 0xdfff }).map((c) => String.fromCharCode(c));
    const text = fc.array(fc.oneof(surrogate, fc.constantFrom('fix', ' ', 'tap', '🔧', '\u202E', '\u200B')), { minLength: 1, maxLength: 8 }).map((p) => `x ${p.join('')}`);
    fc.assert(
      fc.property(fc.array(fc.tuple(text, surrogate), { minLength: 1, maxLength: 4 }), (pairs) => {
        const list: Utterance[] = pairs.map(([t, s], i) => ({ id: `hr-${i}${s}`, text: t, tokens: [{ start: 0, end: 1 }], tags: ['O'], meta: { note: s } }));
        const written = jsonlWrite(list);
        // Strict UTF-8 decoding of the encoded file succeeds: no lone surrogate reached the bytes.
        const bytes = new TextEncoder().encode(written);
        expect(new TextDecoder('utf-8', { fatal: true }).decode(bytes)).toBe(written);
        expect(/[\uD800-\uDFFF]/.test(written.replace(/[\uD800-\uDBFF][\uDC00-\uDFFF]/g, ''))).toBe(false);
        for (const line of written.trimEnd().split('\n')) JSON.parse(line);
        const doc = jsonlRead(written, { tokeniser: { kind: 'whitespace' } });
        expect(doc.errors).toEqual([]);
        expect(doc.utterances.map((u) => [u.id, u.text, u.meta, u.tokens])).toEqual(list.map((u) => [u.id, u.text, u.meta, u.tokens]));
      }),
      { seed: 42, numRuns: 500 },
    );
  });
});
