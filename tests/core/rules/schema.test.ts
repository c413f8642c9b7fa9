import { describe, expect, it } from 'vitest';
import { schemaValidate } from '../../../src/core/rules';
import type { LabelSchema } from '../../../src/core/rules';

const SCHEMA: LabelSchema = {
  slots: ['service', 'problem', 'area', 'day', 'time_window', 'budget', 'contact_phone'],
  intents: ['book_visit', 'reschedule', 'cancel', 'ask_price', 'check_status'],
  allowedSlotsByIntent: { cancel: ['day', 'contact_phone'], ask_price: ['service', 'problem', 'budget'] },
};

describe('schemaValidate', () => {
  it('accepts known slots and intents', () => {
    expect(schemaValidate({ tags: ['O', 'B-service', 'O', 'B-day', 'B-time_window', 'I-time_window'], intent: 'book_visit' }, SCHEMA)).toEqual([]);
  });

  it('reports an unknown slot once per span, at its first token', () => {
    expect(schemaValidate({ tags: ['O', 'B-colour', 'I-colour', 'O', 'B-colour'] }, SCHEMA)).toEqual([
      { index: 1, rule: 'schema/unknown-slot', name: 'colour', message: "slot colour (tokens 1-2) is not in the project's slot list" },
      { index: 4, rule: 'schema/unknown-slot', name: 'colour', message: "slot colour (token 4) is not in the project's slot list" },
    ]);
  });

  it('reads stray tags leniently (a stray I- starts a span), like the decoder', () => {
    expect(schemaValidate({ tags: ['O', 'I-colour'] }, SCHEMA).map((i) => i.index)).toEqual([1]);
  });

  it('reports an intent outside the list with a null index', () => {
    expect(schemaValidate({ tags: ['O'], intent: 'order_pizza' }, SCHEMA)).toEqual([
      { index: null, rule: 'schema/unknown-intent', name: 'order_pizza', message: "intent order_pizza is not in the project's intent list" },
    ]);
  });

  it('checks no intent when the schema gives no list, or the utterance has none', () => {
    expect(schemaValidate({ tags: ['B-day'], intent: 'order_pizza' }, { slots: ['day'] })).toEqual([]);
    expect(schemaValidate({ tags: ['B-day'] }, SCHEMA)).toEqual([]);
    expect(schemaValidate({ tags: ['B-day'], intent: '' }, SCHEMA)).toEqual([]);
  });

  it('reports slots not allowed for the intent, and only for intents that have a list', () => {
    const tags = ['B-service', 'O', 'B-day', 'O', 'B-contact_phone'];
    expect(schemaValidate({ tags, intent: 'cancel' }, SCHEMA)).toEqual([
      { index: 0, rule: 'schema/slot-not-allowed-for-intent', name: 'service', message: 'slot service (token 0) is not allowed for intent cancel' },
    ]);
    expect(schemaValidate({ tags, intent: 'book_visit' }, SCHEMA)).toEqual([]);
  });

  it('reports an unknown slot as unknown only, not also as not allowed', () => {
    expect(schemaValidate({ tags: ['B-colour'], intent: 'cancel' }, SCHEMA).map((i) => i.rule)).toEqual(['schema/unknown-slot']);
  });

  it('reports the intent and its slots together, intent first', () => {
    const issues = schemaValidate({ tags: ['B-budget', 'B-colour'], intent: 'complain' }, { ...SCHEMA, allowedSlotsByIntent: { complain: ['day'] } });
    expect(issues.map((i) => [i.index, i.rule])).toEqual([
      [null, 'schema/unknown-intent'],
      [0, 'schema/slot-not-allowed-for-intent'],
      [1, 'schema/unknown-slot'],
    ]);
  });

  it('does not mistake inherited object keys for intents or slot lists', () => {
    expect(schemaValidate({ tags: ['B-day'], intent: 'constructor' }, { slots: ['day'], allowedSlotsByIntent: {} })).toEqual([]);
  });
});
