/** Test databases on fake-indexeddb (each with its own factory, so tests never share data) and sample data. */
import { IDBFactory, IDBKeyRange } from 'fake-indexeddb';
import { tokeniseWhitespace } from '../../src/core/tokenise';
import type { Utterance } from '../../src/core/types';
import { dbOpen, type DbOpenOptions, type SlotsmithDb } from '../../src/db/schema';

export const CLOCK_START = Date.UTC(2025, 2, 14, 9, 30);

/** A clock that ticks one second per call, so time stamps are distinct and predictable. */
export function clockTicking(start = CLOCK_START): () => number {
  let now = start - 1000;
  return () => (now += 1000);
}

export function dbTest(options: DbOpenOptions & { factory?: IDBFactory; name?: string } = {}): SlotsmithDb {
  const { factory = new IDBFactory(), name = 'slotsmith-test', ...rest } = options;
  return dbOpen(name, { indexedDB: factory, IDBKeyRange, clock: clockTicking(), ...rest });
}

/** A tagged utterance of the home-repair booking scenario; `tags` may be illegal on purpose. */
export function utteranceMake(text: string, tags?: string[], extra: Partial<Utterance> = {}): Utterance {
  const tokens = tokeniseWhitespace(text);
  return { text, tokens, tags: tags ?? tokens.map(() => 'O'), meta: {}, ...extra };
}

export const SAMPLE: Utterance[] = [
  utteranceMake('book a plumber for Friday morning', ['O', 'O', 'B-service', 'O', 'B-day', 'B-time_window'], { id: 'hr-001', intent: 'book_visit', line: 1 }),
  // I-day after O: an illegal IOB2 transition, kept exactly as imported.
  utteranceMake('move it to Monday please', ['O', 'O', 'O', 'I-day', 'O'], { id: 'hr-002', intent: 'reschedule', line: 9 }),
  utteranceMake('how much to fix a leaking tap 🔧', ['O', 'O', 'O', 'O', 'O', 'B-problem', 'I-problem', 'O'], { intent: 'ask_price', meta: { source: 'web' } }),
  utteranceMake('תקנו את הברז מחר call 555-0142', ['O', 'O', 'B-problem', 'B-day', 'O', 'B-contact_phone'], { id: 'hr-004' }),
];
