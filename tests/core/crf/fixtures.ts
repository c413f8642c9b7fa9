import type { CrfSequence } from '../../../src/core/crf';

/** Invented home-repair requests (our own scenario), tagged in IOB2. */
export const TINY: CrfSequence[] = [
  { words: ['book', 'a', 'plumber', 'for', 'monday'], tags: ['O', 'O', 'B-service', 'O', 'B-day'] },
  { words: ['my', 'kitchen', 'tap', 'is', 'leaking'], tags: ['O', 'B-area', 'I-area', 'O', 'B-problem'] },
  { words: ['can', 'an', 'electrician', 'come', 'on', 'friday', 'morning'], tags: ['O', 'O', 'B-service', 'O', 'O', 'B-day', 'B-time_window'] },
  { words: ['call', 'me', 'on', '555-0142'], tags: ['O', 'O', 'O', 'B-contact_phone'] },
  { words: ['cancel', 'the', 'roofer', 'visit'], tags: ['O', 'O', 'B-service', 'O'] },
  { words: ['the', 'boiler', 'makes', 'a', 'banging', 'noise'], tags: ['O', 'B-problem', 'I-problem', 'I-problem', 'I-problem', 'I-problem'] },
  { words: ['budget', 'is', 'under', '200', 'pounds'], tags: ['O', 'O', 'B-budget', 'I-budget', 'I-budget'] },
  { words: ['Tuesday', 'afternoon', 'suits', 'me'], tags: ['B-day', 'B-time_window', 'O', 'O'] },
];
