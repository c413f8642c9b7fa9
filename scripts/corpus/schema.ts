/** The label schema of the invented home-repair booking corpus: intents, slots, and which go together. */

export const CORPUS_INTENTS = [
  'book_visit',
  'reschedule',
  'cancel',
  'ask_price',
  'check_status',
  'confirm',
  'other',
] as const;
export type CorpusIntent = (typeof CORPUS_INTENTS)[number];

export const CORPUS_SLOTS = [
  'service',
  'problem',
  'area',
  'day',
  'time_window',
  'budget',
  'contact_phone',
  'booking_ref',
] as const;
export type CorpusSlot = (typeof CORPUS_SLOTS)[number];

export const CORPUS_INTENT_DESCRIPTIONS: Record<CorpusIntent, string> = {
  book_visit: 'Ask for a tradesperson to come round.',
  reschedule: 'Move an existing booking to another day or time.',
  cancel: 'Call off an existing booking.',
  ask_price: 'Ask what a job or a call-out costs.',
  check_status: 'Ask whether or when a booked visit is happening.',
  confirm: 'Accept a proposed day, time or detail.',
  other: 'Small talk, thanks, or questions outside booking.',
};

export const CORPUS_SLOT_DESCRIPTIONS: Record<CorpusSlot, string> = {
  service: 'The trade wanted (plumber, locksmith...), without the article.',
  problem: 'What is wrong (leaking tap, no hot water...), without a leading article.',
  area: 'Invented neighbourhood or fictional postcode (first letter Q or X, unused in UK postcodes).',
  day: 'A day or date; "next"/"this" belong to the value, a leading "on" or "the" does not.',
  time_window: 'Time of day or range, with its bounding words (between, after, before); "in the"/"at" do not belong.',
  budget: 'Amount with currency, with its limiting word (under, max, up to, about).',
  contact_phone: 'A fictional phone number, 555-0100 to 555-0199, in various spellings.',
  booking_ref: 'A booking reference such as HR-4821 or BK7731.',
};

/** Slots each intent may carry in the reference ("truth") layer. */
export const CORPUS_INTENT_SLOTS: Record<CorpusIntent, readonly CorpusSlot[]> = {
  book_visit: ['service', 'problem', 'area', 'day', 'time_window', 'budget', 'contact_phone'],
  reschedule: ['booking_ref', 'service', 'day', 'time_window', 'contact_phone'],
  cancel: ['booking_ref', 'service', 'problem', 'day', 'time_window', 'contact_phone'],
  ask_price: ['service', 'problem', 'area', 'day', 'time_window', 'budget'],
  check_status: ['booking_ref', 'service', 'area', 'day', 'time_window', 'contact_phone'],
  confirm: ['day', 'time_window', 'contact_phone'],
  other: ['area', 'service'],
};

export interface CorpusSchemaJson {
  name: string;
  scheme: 'iob2';
  tokeniser: { kind: 'words' };
  intents: { name: CorpusIntent; description: string; slots: CorpusSlot[] }[];
  slots: { name: CorpusSlot; description: string }[];
}

/** The schema as written to sample-corpus/schema.json. */
export function corpusSchemaJson(): CorpusSchemaJson {
  return {
    name: 'home-repair booking assistant (invented)',
    scheme: 'iob2',
    tokeniser: { kind: 'words' },
    intents: CORPUS_INTENTS.map((name) => ({
      name,
      description: CORPUS_INTENT_DESCRIPTIONS[name],
      slots: [...CORPUS_INTENT_SLOTS[name]],
    })),
    slots: CORPUS_SLOTS.map((name) => ({ name, description: CORPUS_SLOT_DESCRIPTIONS[name] })),
  };
}
