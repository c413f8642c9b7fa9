export type LandisKochBand = 'poor' | 'slight' | 'fair' | 'moderate' | 'substantial' | 'almost perfect';

export const LANDIS_KOCH_CAUTION =
  'Landis & Koch (1977) bands are a convention for describing kappa, not thresholds of adequacy; ' +
  'the same agreement can give a different kappa with other category counts or prevalence.';

/**
 * Band a kappa value as Landis & Koch (1977) did: < 0 poor, 0–0.20 slight, 0.21–0.40 fair,
 * 0.41–0.60 moderate, 0.61–0.80 substantial, 0.81–1 almost perfect. Their table gives two-decimal
 * bounds; we read each band as closed above, (0.20, 0.40] fair and so on, so 0.205 is fair (our reading).
 */
export function landisKoch(value: number): { band: LandisKochBand; caution: string } {
  const band: LandisKochBand =
    value < 0
      ? 'poor'
      : value <= 0.2
        ? 'slight'
        : value <= 0.4
          ? 'fair'
          : value <= 0.6
            ? 'moderate'
            : value <= 0.8
              ? 'substantial'
              : 'almost perfect';
  return { band, caution: LANDIS_KOCH_CAUTION };
}
