/** How the agreement screen writes its figures: plain functions, tested apart from React. */
import { landisKoch, type Interval, type KappaFigure } from '../../../core/agreement';

/** Three decimals, as the command line's text report prints them; a dash with the reason when undefined. */
export function figureText(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toFixed(3);
}

export function intervalText(interval: Interval | null | undefined): string {
  if (interval === null || interval === undefined) return 'not computed';
  if (interval.low === null || interval.high === null) return interval.reason ?? 'undefined';
  return `${figureText(interval.low)} to ${figureText(interval.high)}`;
}

/** The Landis & Koch band of a kappa, or null when the kappa is undefined. */
export function kappaBand(figure: KappaFigure | { value: number | null }): string | null {
  return figure.value === null ? null : landisKoch(figure.value).band;
}

export function countText(n: number): string {
  return n.toLocaleString('en');
}

/** "done", "done and draft", "done, draft and flagged". */
export function listText(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1] ?? ''}`;
}

/** A UTC calendar day, e.g. 2025-03-14, so the same data reads the same everywhere. */
export function dayText(time: number): string {
  return new Date(time).toISOString().slice(0, 10);
}

/** A UTC time to the minute, e.g. 2025-03-14 09:30. */
export function timeText(time: number): string {
  return new Date(time).toISOString().slice(0, 16).replace('T', ' ');
}

/** `rgb(r, g, b)` (as d3's interpolators return) or `#rrggbb` into `#RRGGBB`. */
export function colourHex(colour: string): string {
  const rgb = /^rgb\(\s*(\d+)\s*,\s*(\d+)\s*,\s*(\d+)\s*\)$/.exec(colour);
  if (rgb === null) return colour.toUpperCase();
  return `#${rgb
    .slice(1, 4)
    .map((c) => Number(c).toString(16).padStart(2, '0'))
    .join('')
    .toUpperCase()}`;
}

/** Axis labels of a time axis: days, or days with hours when the axis spans three days or less. */
export function timeTickText(time: number, span: number): string {
  return span <= 3 * 86_400_000 ? timeText(time).slice(5) : dayText(time);
}
