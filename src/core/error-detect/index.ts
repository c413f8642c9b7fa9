export { corpusFlatten, type FlatCorpus } from './corpus-flat';
export { identicalFind } from './identical';
export { findingKey, findingLocations, findingsUndismissed } from './key';
export {
  MODEL_DISAGREEMENT_MIN_CONFIDENCE,
  modelDisagreementsFind,
  stretchesDiffering,
  type ModelComparedUtterance,
  type ModelDisagreementOptions,
} from './model-disagreement';
export { tagsNormalise, tokenFold } from './normalise';
export {
  SLOT_OUTLIER_MIN_MAJORITY,
  SLOT_OUTLIER_MIN_RATIO,
  slotOutliersFind,
  type SlotOutlierOptions,
} from './slot-outliers';
export * from './types';
export { VARIATION_MAX_LENGTH, variationCompare, variationFind, type VariationOptions } from './variation';
