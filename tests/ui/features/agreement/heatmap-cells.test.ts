import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cellCountText, cividisStops, heatCells, LEGEND_SHARES } from '../../../../src/ui/features/agreement/heatmap-cells';

/** WCAG 2.1 relative luminance and contrast ratio (Understanding SC 1.4.3; constants from memory), written apart from the app's. */
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => {
    const c = parseInt(hex.slice(i, i + 2), 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  }) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}
function contrast(a: string, b: string): number {
  const [x, y] = [luminance(a), luminance(b)].sort((p, q) => q - p) as [number, number];
  return (x + 0.05) / (y + 0.05);
}

describe('heatCells', () => {
  it('gives each cell its row share, and the count as text readable on its colour (WCAG AA, 4.5:1)', () => {
    const counts = [
      [3033, 3, 1, 0],
      [8, 90, 0, 0],
      [0, 0, 0, 0],
      [20, 0, 23, 175],
    ];
    const cells = heatCells(counts);
    expect(cells).toHaveLength(16);
    expect(cells[5]).toMatchObject({ row: 1, column: 1, count: 90, share: 90 / 98, label: '90' });
    // An empty row has nothing to share out.
    expect(cells.filter((c) => c.row === 2).every((c) => c.share === 0)).toBe(true);
    for (const c of cells) expect(contrast(c.fill, c.text)).toBeGreaterThanOrEqual(4.5);
  });

  it('keeps text readable and colour lighter with a larger share, for any counts (fast-check)', () => {
    fc.assert(
      fc.property(fc.array(fc.nat({ max: 1_000_000 }), { minLength: 2, maxLength: 12 }), (row) => {
        const cells = heatCells([row]);
        for (const c of cells) expect(contrast(c.fill, c.text)).toBeGreaterThanOrEqual(4.5);
        // Cividis rises in lightness from end to end (Nuñez et al. 2018), so order of share is order of luminance.
        const byShare = [...cells].sort((a, b) => a.share - b.share);
        for (let i = 1; i < byShare.length; i++) expect(luminance((byShare[i] as { fill: string }).fill)).toBeGreaterThanOrEqual(luminance((byShare[i - 1] as { fill: string }).fill) - 1e-9);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('shortens only counts of five digits or more', () => {
    expect(cellCountText(9999)).toBe('9,999');
    expect(cellCountText(12_345)).toBe('12.3K');
    expect(cellCountText(1_152_340)).toBe('1.2M');
  });

  it('places the legend marks where their colours are', () => {
    const stops = cividisStops(11);
    expect(stops[0]?.offset).toBe(0);
    expect(stops.at(-1)?.offset).toBe(1);
    const quarter = LEGEND_SHARES.find((m) => m.share === 0.25);
    expect(quarter?.at).toBe(0.5);
    // A quarter of the row is drawn in the gradient's middle colour.
    expect(heatCells([[1, 3]])[0]?.fill).toBe(stops[5]?.colour);
  });
});
