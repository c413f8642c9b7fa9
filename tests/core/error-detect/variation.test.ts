import { describe, expect, it } from 'vitest';
import { variationFind } from '../../../src/core/error-detect';
import { said } from './corpus';

// Dickinson & Meurers (2003), "Detecting errors in part-of-speech annotation" (EACL): a variation
// n-gram is a recurring n-gram whose tags differ on some token, the variation nucleus; from memory,
// non-fringe nuclei (identical context on both sides) and longer n-grams are the likelier errors.
// The corpora below are invented and the expected findings worked out by hand.
const corpus = [
  said('hr-001', 'book a plumber for monday morning', ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window']),
  said('hr-002', 'book a plumber for monday morning', ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window']),
  said('hr-003', 'Book a plumber for Monday morning', ['O', 'O', 'O', 'O', 'B-day', 'B-time_window']),
  said('hr-004', 'i need a plumber', ['O', 'O', 'O', 'B-service']),
  said('hr-005', 'leak in the kitchen', ['B-problem', 'O', 'O', 'B-area']),
  said('hr-006', 'redo the kitchen', ['O', 'O', 'O']),
];

describe('variation n-grams (Dickinson & Meurers 2003)', () => {
  it('finds the maximal variation n-grams and ranks the non-fringe nucleus first', () => {
    const findings = variationFind(corpus);
    // "plumber" alone always follows "a", so it is left to "a plumber"; "book a plumber for monday
    // morning" is the longest context (6 = the default limit); "kitchen" always follows "the".
    expect(findings.map((f) => f.tokens.join(' '))).toEqual(['book a plumber for monday morning', 'a plumber', 'the kitchen']);
    const [whole, short, kitchen] = findings;
    expect(whole).toMatchObject({ nucleus: { start: 2, end: 3 }, fringe: false, occurrences: 3 });
    expect(short).toMatchObject({ nucleus: { start: 1, end: 2 }, fringe: true, occurrences: 4 });
    expect(kitchen).toMatchObject({ nucleus: { start: 1, end: 2 }, fringe: true, occurrences: 2 });
  });

  it('groups readings majority first, and locations point at the nucleus in each utterance', () => {
    const whole = variationFind(corpus)[0];
    expect(whole?.readings).toEqual([
      {
        tags: ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'],
        locations: [
          { id: 'hr-001', layer: 'lead', start: 2, end: 3 },
          { id: 'hr-002', layer: 'lead', start: 2, end: 3 },
        ],
      },
      { tags: ['O', 'O', 'O', 'O', 'B-day', 'B-time_window'], locations: [{ id: 'hr-003', layer: 'lead', start: 2, end: 3 }] },
    ]);
    const short = variationFind(corpus)[1];
    expect(short?.readings.map((r) => r.locations.map((l) => `${l.id}@${String(l.start)}`))).toEqual([
      ['hr-001@2', 'hr-002@2', 'hr-004@3'],
      ['hr-003@2'],
    ]);
  });

  it('a shorter limit reports the longest n-gram that fits', () => {
    const findings = variationFind(corpus, { maxLength: 3 });
    // At n = 3 every window around the nucleus is final; windows with the nucleus inside come first.
    const texts = findings.map((f) => f.tokens.join(' '));
    expect(texts[0]).toBe('a plumber for');
    expect(findings[0]?.fringe).toBe(false);
    expect(texts).toContain('book a plumber');
    expect(texts).toContain('plumber for monday');
  });

  it('reads a stray I- the CoNLL-2000 way, so it does not vary from B-', () => {
    const findings = variationFind([
      said('hr-010', 'kitchen sink', ['I-area', 'B-problem']),
      said('hr-011', 'kitchen sink', ['B-area', 'B-problem']),
    ]);
    expect(findings).toEqual([]);
  });

  it('a multi-token nucleus spans every varying token', () => {
    const findings = variationFind([
      said('hr-020', 'fix the hot water tank today', ['O', 'O', 'B-problem', 'I-problem', 'I-problem', 'B-day']),
      said('hr-021', 'fix the hot water tank today', ['O', 'O', 'O', 'B-service', 'I-service', 'B-day']),
    ]);
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ nucleus: { start: 2, end: 5 }, fringe: false, occurrences: 2 });
  });

  it('case-folds tokens', () => {
    const findings = variationFind([
      said('hr-030', 'Electrician', ['B-service']),
      said('hr-031', 'electrician', ['O']),
    ]);
    expect(findings.map((f) => f.tokens)).toEqual([['electrician']]);
  });
});
