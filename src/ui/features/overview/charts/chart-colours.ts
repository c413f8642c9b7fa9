/**
 * Colours of the overview's charts: the Okabe & Ito (2008) colour-blind-safe palette ("Color
 * Universal Design", as src/core/schema-edit/palette.ts cites it), and a neutral for "not started".
 * Every coloured mark also carries its name (legend, direct label or table), so colour is never the
 * only cue (WCAG 2.2, 1.4.1).
 */
import type { LayerStatus } from '../../../../core/backup/model';
import { OKABE_ITO, paletteTextOn } from '../../../../core/schema-edit/palette';

const hex = (name: string) => OKABE_ITO.find((c) => c.name === name)?.hex ?? '#000000';

export const STATUS_COLOURS: Record<LayerStatus, string> = {
  done: hex('bluish green'),
  draft: hex('sky blue'),
  flagged: hex('vermillion'),
  skipped: hex('orange'),
  // Common practice, no source: a light neutral for work not started.
  unlabelled: '#D9D4C7',
};

/** The i-th series colour; the palette's yellow is skipped, as a thin line of it is hard to see on a light page. */
export function seriesColour(i: number): string {
  const usable = OKABE_ITO.filter((c) => c.name !== 'yellow');
  return (usable[i % usable.length] as { hex: string }).hex;
}

export function textOn(fill: string): string {
  return paletteTextOn(fill);
}
