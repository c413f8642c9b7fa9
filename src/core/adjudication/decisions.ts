/**
 * The adjudicator's decisions, kept as lines of the gold layer's note: readable by people, stored in
 * every history row with the rest of the layer (so each decision's who and when are there), and
 * parsed back to know which disagreements are settled. One line per disagreement, newest wins:
 * `tokens 3-4: took ann-a (the customer names the day)`, `intent: took ann-b`.
 */
import type { DiffRegion } from './diff';

export const INTENT_KEY = 'intent';

/** A region's key: its tokens 1-based and inclusive, as people count them. */
export function regionKey(region: { start: number; end: number }): string {
  return `tokens ${region.start + 1}-${region.end}`;
}

const LINE_PATTERN = /^(tokens \d+-\d+|intent): /;

/** One decision line; the reason is optional and kept on one line. */
export function decisionLine(key: string, what: string, reason = ''): string {
  const why = reason.replace(/\s+/gu, ' ').trim();
  return `${key}: ${what}${why === '' ? '' : ` (${why})`}`;
}

function lineKey(line: string): string | null {
  return LINE_PATTERN.exec(line)?.[1] ?? null;
}

/** The note with the decision for `key` set to `line` (replacing an earlier one for that key). */
export function noteDecide(note: string, key: string, line: string): string {
  const lines = note === '' ? [] : note.split('\n').filter((l) => lineKey(l) !== key);
  return [...lines, line].join('\n');
}

/** Keys that have a decision line in the note. */
export function noteDecidedKeys(note: string): Set<string> {
  const keys = new Set<string>();
  for (const line of note.split('\n')) {
    const key = lineKey(line);
    if (key !== null) keys.add(key);
  }
  return keys;
}

/** The disagreements of an utterance as keys: each region, then the intent when it differs. */
export function disagreementKeys(regions: readonly DiffRegion[], intentDiffers: boolean): string[] {
  return [...regions.map(regionKey), ...(intentDiffers ? [INTENT_KEY] : [])];
}
