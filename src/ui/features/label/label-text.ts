/** Words and colours of the span editor, kept out of the components so they can be tested. */
import type { SlotDef } from '../../../core/backup/model';
import type { LayerEdit, TokenSelection } from '../../../core/editing';
import { spansFromTags } from '../../../core/schemes';
import type { Span, Token } from '../../../core/types';

/**
 * Okabe & Ito (2008), "Color Universal Design", the eight colours distinguishable with the common
 * colour-vision deficiencies (hex values from memory); used when the schema gives a slot no colour.
 */
export const OKABE_ITO = ['#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7', '#000000'] as const;

/** The slot's colour from the schema, else a palette colour by its position. */
export function slotColour(slots: readonly SlotDef[], name: string): string {
  const index = slots.findIndex((s) => s.name === name);
  const own = slots[index]?.colour;
  if (own !== undefined && /^#[0-9a-fA-F]{6}$/.test(own)) return own;
  const at = index < 0 ? [...name].reduce((h, c) => (h * 31 + (c.codePointAt(0) ?? 0)) >>> 0, 7) : index;
  return OKABE_ITO[at % OKABE_ITO.length] as string;
}

/**
 * A light tint of `hex` (mixed with white) as a token background, so dark text keeps AA contrast
 * whatever the slot colour; the full colour goes on the underline.
 */
export function colourTint(hex: string, amount = 0.28): string {
  const channel = (i: number) => Math.round(255 - (255 - parseInt(hex.slice(i, i + 2), 16)) * amount);
  return `rgb(${channel(1)}, ${channel(3)}, ${channel(5)})`;
}

/** The text a span covers, from its first token's start to its last token's end. */
export function spanText(text: string, tokens: readonly Token[], span: Span): string {
  const first = tokens[span.start];
  const last = tokens[span.end - 1];
  return first === undefined || last === undefined ? '' : text.slice(first.start, last.end);
}

/** One line per span (`day: “Friday morning”`), for prompts and the other layers' summary. */
export function spansDescribe(text: string, tokens: readonly Token[], tags: readonly string[]): string[] {
  return spansFromTags(tags).map((s) => `${s.slot}: “${spanText(text, tokens, s)}”`);
}

/** A layer in words: its spans, intent, status and note. */
export function layerDescribe(text: string, tokens: readonly Token[], edit: LayerEdit): string[] {
  const spans = spansDescribe(text, tokens, edit.tags);
  return [
    spans.length === 0 ? 'No slots labelled' : `Slots: ${spans.join('; ')}`,
    `Intent: ${edit.intent ?? 'none chosen'}`,
    `Status: ${edit.status}`,
    ...(edit.note === '' ? [] : [`Note: ${edit.note}`]),
  ];
}

/** The accessible name of one token: its text, and its slot when labelled (first token says so). */
export function tokenName(tokenText: string, tags: readonly string[], index: number): string {
  const span = spansFromTags(tags).find((s) => s.start <= index && index < s.end);
  if (span === undefined) return tokenText;
  return `${tokenText}, ${span.slot}${span.start === index ? ' (starts)' : ''}`;
}

/** The slot list, filtered by what was typed: names starting with it first, then names containing it. */
export function slotsMatching(slots: readonly SlotDef[], typed: string): SlotDef[] {
  const q = typed.trim().toLowerCase();
  if (q === '') return [...slots];
  const starts = slots.filter((s) => s.name.toLowerCase().startsWith(q));
  const contains = slots.filter((s) => !s.name.toLowerCase().startsWith(q) && (s.name.toLowerCase().includes(q) || (s.description ?? '').toLowerCase().includes(q)));
  return [...starts, ...contains];
}

/** The selected tokens' text (for the token list's accessible name), or "nothing". */
export function selectedText(text: string, tokens: readonly { start: number; end: number }[], selection: TokenSelection): string {
  const from = Math.min(selection.anchor, selection.focus);
  const to = Math.max(selection.anchor, selection.focus);
  return spanText(text, tokens, { start: from, end: to + 1, slot: '' }) || 'nothing';
}
