export { alignBuilder, layerDataAlign, layersAlign, type AlignBuilder } from './align';
export { AlignLayerGatherer, type AlignLayerData } from './align-layer';
export { bootstrapPatchPlan, bootstrapPatchRange, bootstrapTotalsPatched, totalsAdd, type BootstrapPatchPlan, type BootstrapTotals } from './bootstrap-patch';
export {
  bootstrapRange,
  bootstrapTotalsRange,
  resampleValuesFromTotals,
  mulberry32,
  percentileInterval,
  quantileSorted,
  resampleValuesJoin,
  type Interval,
  type ResampleValues,
} from './bootstrap';
export {
  alphaFromCounts,
  fleissFromCounts,
  kappaFromCounts,
  REASON_EMPTY,
  REASON_EXPECTED_ONE,
  REASON_NO_PAIRABLE,
  type AlphaFigure,
  type KappaFigure,
} from './kappa';
export { LANDIS_KOCH_CAUTION, landisKoch, type LandisKochBand } from './landis-koch';
export { alphaSlot, fleissSlot, pairSlotKappa, pairwiseSlotKappa, type FleissFigure, type PairwiseKappa } from './multi';
export {
  agreementCompute,
  agreementIntervalsAdd,
  agreementPrepare,
  REASON_NO_SPANS,
  type AgreementIntervals,
  type AgreementOptions,
  type AgreementPending,
  type AgreementReport,
  type BootstrapJob,
  type Disagreement,
  type SlotFigures,
  type SpanFigures,
} from './report';
export * from './types';
