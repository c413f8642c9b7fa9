/**
 * Dismissed finding keys in a backup. Most keys are built from content alone, but a model-disagreement
 * key names its utterance by database id (src/core/error-detect/key.ts, with the id src/workers/
 * findings-run.ts gives each utterance). A backup never holds database ids, so such keys name the
 * utterance by seq there and are renamed on backup and restore; kept verbatim, a restored dismissal
 * would name an id of the old project and never match a finding again.
 */
import type { BackupDismissal } from './model';

const MODEL_DISAGREEMENT = 'model-disagreement';

/** The utterance a finding key names (its second item, for a model disagreement), or null when it names none. */
export function dismissalKeyUtterance(key: string): string | null {
  if (!key.startsWith(`["${MODEL_DISAGREEMENT}",`)) return null;
  let parsed: unknown;
  try {
    parsed = JSON.parse(key);
  } catch {
    return null;
  }
  return Array.isArray(parsed) && parsed[0] === MODEL_DISAGREEMENT && typeof parsed[1] === 'string' ? parsed[1] : null;
}

/** The same key naming `utterance` instead; as findingKey writes it (JSON.stringify of the same list). */
export function dismissalKeyRenamed(key: string, utterance: string): string {
  const parsed = JSON.parse(key) as unknown[];
  parsed[1] = utterance;
  return JSON.stringify(parsed);
}

/** A whole-number seq or database id as a key writes it ("12"); null for anything else. */
export function dismissalKeyNumber(named: string): number | null {
  return /^[1-9][0-9]{0,15}$/.test(named) && Number.isSafeInteger(Number(named)) ? Number(named) : null;
}

/**
 * Dismissals with each utterance-naming key renamed through `rename` (from one numbering to the other);
 * a key whose utterance `rename` does not know (null) is left out and passed to `dropped`.
 */
export function dismissalsRenamed(
  dismissed: Readonly<Record<string, BackupDismissal>>,
  rename: (named: number) => number | null | undefined,
  dropped: (key: string) => void = () => {},
): Record<string, BackupDismissal> {
  const entries: [string, BackupDismissal][] = [];
  for (const [key, dismissal] of Object.entries(dismissed)) {
    const named = dismissalKeyUtterance(key);
    if (named === null) {
      entries.push([key, dismissal]);
      continue;
    }
    const number = dismissalKeyNumber(named);
    const renamed = number === null ? null : rename(number);
    if (renamed === null || renamed === undefined) dropped(key);
    else entries.push([dismissalKeyRenamed(key, String(renamed)), dismissal]);
  }
  // fromEntries defines own properties, so even a "__proto__" key stays a plain entry.
  return Object.fromEntries(entries);
}
