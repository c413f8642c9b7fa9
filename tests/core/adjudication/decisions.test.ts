import { describe, expect, it } from 'vitest';
import { decisionLine, disagreementKeys, INTENT_KEY, noteDecide, noteDecidedKeys, regionKey } from '../../../src/core/adjudication';

describe('decision lines in the gold note', () => {
  it('names regions by 1-based inclusive token numbers and keeps the reason on one line', () => {
    expect(regionKey({ start: 3, end: 5 })).toBe('tokens 4-5');
    expect(decisionLine('tokens 4-5', 'took ann-a', ' the customer\nnames the day ')).toBe('tokens 4-5: took ann-a (the customer names the day)');
    expect(decisionLine(INTENT_KEY, 'took ann-b')).toBe('intent: took ann-b');
  });

  it('replaces an earlier decision for the same disagreement and keeps free text that is no decision', () => {
    let note = 'checked with the booking team';
    note = noteDecide(note, 'tokens 1-2', 'tokens 1-2: took ann-a');
    note = noteDecide(note, INTENT_KEY, 'intent: took ann-b');
    note = noteDecide(note, 'tokens 1-2', 'tokens 1-2: took ann-b (typo in A)');
    expect(note).toBe('checked with the booking team\nintent: took ann-b\ntokens 1-2: took ann-b (typo in A)');
    expect([...noteDecidedKeys(note)].sort()).toEqual(['intent', 'tokens 1-2']);
    expect(noteDecidedKeys('')).toEqual(new Set());
  });

  it('lists the disagreements of an utterance: regions in order, then the intent', () => {
    const regions = [
      { start: 0, end: 1, a: [], b: [] },
      { start: 4, end: 6, a: [], b: [] },
    ];
    expect(disagreementKeys(regions, true)).toEqual(['tokens 1-1', 'tokens 5-6', 'intent']);
    expect(disagreementKeys(regions, false)).toEqual(['tokens 1-1', 'tokens 5-6']);
  });
});
