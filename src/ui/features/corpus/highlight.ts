/**
 * Slot highlights for the utterance text: the text cut into plain and labelled pieces at token
 * offsets (so it reads exactly as stored), and each slot's colour with a light tint behind the text.
 */
import type { ProjectSchema } from '../../../core/backup/model';
import { spansFromTags } from '../../../core/schemes';

export interface HighlightSegment {
  text: string;
  /** The slot of a labelled piece; null for text outside any span. */
  slot: string | null;
}

/**
 * Pieces of `text` in order; they join back to `text`. `tokens` are start,end pairs (UTF-16); spans
 * come from `tags` by the lenient reading (spansFromTags), so illegal sequences still show.
 */
export function highlightSegments(text: string, tokens: ArrayLike<number>, tags: readonly string[] | null): HighlightSegment[] {
  const segments: HighlightSegment[] = [];
  let at = 0;
  const tokenCount = tokens.length >> 1;
  for (const span of tags === null ? [] : spansFromTags(tags)) {
    if (span.end > tokenCount) break;
    const start = tokens[2 * span.start] as number;
    const end = tokens[2 * (span.end - 1) + 1] as number;
    if (start < at || end > text.length) continue;
    if (start > at) segments.push({ text: text.slice(at, start), slot: null });
    segments.push({ text: text.slice(start, end), slot: span.slot });
    at = end;
  }
  if (at < text.length || segments.length === 0) segments.push({ text: text.slice(at), slot: null });
  return segments;
}

/**
 * Okabe and Ito's colour-blind-safe palette ("Color Universal Design", 2008), values from memory,
 * black last: the fallback for slots the schema gives no colour.
 */
export const SLOT_PALETTE: readonly string[] = ['#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7', '#000000'];

const HEX = /^#([0-9a-f]{6})$/i;

function rgbOf(hex: string): [number, number, number] | null {
  const match = HEX.exec(hex.trim());
  if (match === null) return null;
  const n = Number.parseInt(match[1] as string, 16);
  return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
}

/** The slot's colour: the schema's when it is a #rrggbb value, else the palette's by the slot's place in the schema. */
export function slotColour(schema: ProjectSchema, slot: string): string {
  const at = schema.slots.findIndex((s) => s.name === slot);
  const own = at < 0 ? undefined : schema.slots[at]?.colour;
  if (own !== undefined && rgbOf(own) !== null) return own;
  // Slots outside the schema get a stable colour from their name.
  let place = at;
  if (place < 0) for (const c of slot) place = (Math.abs(place) * 31 + (c.codePointAt(0) ?? 0)) % 9973;
  return SLOT_PALETTE[Math.abs(place) % SLOT_PALETTE.length] as string;
}

/** `colour` mixed with white, `share` of the colour (0..1), as rgb(): a background dark text stays readable on. */
export function colourTint(colour: string, share = 0.28): string {
  const rgb = rgbOf(colour) ?? [128, 128, 128];
  const mix = rgb.map((c) => Math.round(c * share + 255 * (1 - share)));
  return `rgb(${mix[0]}, ${mix[1]}, ${mix[2]})`;
}

/** WCAG 2.2 contrast ratio of two rgb()/#rrggbb colours (relative luminance as WCAG defines it). */
export function contrastRatio(a: string, b: string): number {
  const parse = (c: string): [number, number, number] => {
    const rgb = /^rgb\((\d+), (\d+), (\d+)\)$/.exec(c);
    if (rgb !== null) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])];
    return rgbOf(c) ?? [0, 0, 0];
  };
  const luminance = (c: string) => {
    const [r, g, bl] = parse(c).map((v) => {
      const s = v / 255;
      return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
    }) as [number, number, number];
    return 0.2126 * r + 0.7152 * g + 0.0722 * bl;
  };
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}
