/**
 * The confusion heatmap's cells as plain values. Colour: cividis (Nuñez, Anderton & Renslow 2018,
 * "Optimizing colormaps with consideration for color vision deficiency to enable accurate
 * interpretation of scientific data", PLOS ONE 13(7)), as d3-scale-chromatic's interpolateCividis;
 * it varies in lightness throughout, so it reads the same with the common colour-vision deficiencies
 * and in greyscale. The share runs through a square root first, so the few-percent confusions that
 * matter stand out from the empty cells (common practice, no source). Text on a cell is black or white,
 * whichever contrasts more (WCAG relative luminance).
 */
import { interpolateCividis } from 'd3-scale-chromatic';
import { paletteTextOn } from '../../../core/schema-edit/palette';
import { colourHex } from './agreement-format';

export interface HeatCell {
  row: number;
  column: number;
  count: number;
  /** Share of the row (layer A's tokens of that slot type) that layer B put in this column; 0 for an empty row. */
  share: number;
  fill: string;
  text: string;
  label: string;
}

const compact = new Intl.NumberFormat('en', { notation: 'compact', maximumFractionDigits: 1 });
const exact = new Intl.NumberFormat('en');

/** Counts up to 9,999 as they are; larger ones shortened (12.3K) so they fit a cell. */
export function cellCountText(count: number): string {
  return count < 10_000 ? exact.format(count) : compact.format(count);
}

export function heatCells(counts: readonly (readonly number[])[]): HeatCell[] {
  const cells: HeatCell[] = [];
  counts.forEach((row, r) => {
    const total = row.reduce((sum, c) => sum + c, 0);
    row.forEach((count, c) => {
      const share = total === 0 ? 0 : count / total;
      const fill = colourHex(interpolateCividis(Math.sqrt(share)));
      cells.push({ row: r, column: c, count, share, fill, text: paletteTextOn(fill), label: cellCountText(count) });
    });
  });
  return cells;
}

/** Colour stops of the legend's gradient, evenly spaced in colour (so in the square root of the share). */
export function cividisStops(count = 11): { offset: number; colour: string }[] {
  return Array.from({ length: count }, (_, i) => ({ offset: i / (count - 1), colour: colourHex(interpolateCividis(i / (count - 1))) }));
}

/** Legend marks: a share and its place along the gradient (0 bottom, 1 top). */
export const LEGEND_SHARES: readonly { share: number; at: number; label: string }[] = [0, 0.01, 0.1, 0.25, 0.5, 1].map((share) => ({ share, at: Math.sqrt(share), label: `${Math.round(share * 100)}%` }));
