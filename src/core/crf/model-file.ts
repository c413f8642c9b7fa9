import { CRF_FEATURE_SET } from './attributes';
import { float64Decode, float64Encode, int32Decode, int32Encode, uint16Decode, uint16Encode } from './base64';
import type { CrfModel, CrfTrainingRecord } from './model';

export const CRF_MODEL_FORMAT = 'slotsmith-crf-model';
export const CRF_MODEL_VERSION = 1;

/**
 * The model file is JSON. Weights are base64 of little-endian float64: a decimal rendering would be
 * about three times larger and JSON numbers only round-trip through careful formatting, while the
 * raw bits make save → load exact (same scores, same tags, same confidences). Float32 would halve
 * the file but change the marginals, so a reloaded model would not reproduce its own output.
 */
export interface CrfModelFile {
  format: typeof CRF_MODEL_FORMAT;
  version: typeof CRF_MODEL_VERSION;
  featureSet: string;
  labels: string[];
  attributes: string[];
  /** Base64, little-endian int32, attributes + 1 entries. */
  featureStarts: string;
  /** Base64, little-endian uint16, one per state feature. */
  featureLabels: string;
  /** Base64, little-endian float64: state weights, then labels² transition weights. */
  weights: string;
  training: CrfTrainingRecord;
}

export function crfModelToJson(model: CrfModel): string {
  if (model.labels.length > 0xffff) throw new RangeError('crfModelToJson: more than 65535 labels');
  const file: CrfModelFile = {
    format: CRF_MODEL_FORMAT,
    version: CRF_MODEL_VERSION,
    featureSet: model.training.featureSet,
    labels: model.labels,
    attributes: model.attributes,
    featureStarts: int32Encode(model.featureStarts),
    featureLabels: uint16Encode(model.featureLabels),
    weights: float64Encode(model.weights),
    training: model.training,
  };
  return JSON.stringify(file);
}

export class CrfModelFileError extends Error {
  override name = 'CrfModelFileError';
}

function field<T>(value: unknown, check: (v: unknown) => boolean, name: string): T {
  if (!check(value)) throw new CrfModelFileError(`model file: "${name}" is missing or has the wrong type`);
  return value as T;
}

const isString = (v: unknown) => typeof v === 'string';
const isStrings = (v: unknown) => Array.isArray(v) && v.every(isString);

/** Parse and check a model file; throws CrfModelFileError on anything that would not tag correctly. */
export function crfModelFromJson(text: string): CrfModel {
  let raw: Record<string, unknown>;
  try {
    raw = JSON.parse(text) as Record<string, unknown>;
  } catch (error) {
    throw new CrfModelFileError(`model file is not JSON: ${(error as Error).message}`);
  }
  if (raw === null || typeof raw !== 'object' || raw.format !== CRF_MODEL_FORMAT) throw new CrfModelFileError(`not a ${CRF_MODEL_FORMAT} file`);
  if (raw.version !== CRF_MODEL_VERSION) throw new CrfModelFileError(`model file version ${String(raw.version)} is not supported (this build reads ${CRF_MODEL_VERSION})`);
  const featureSet = field<string>(raw.featureSet, isString, 'featureSet');
  if (featureSet !== CRF_FEATURE_SET) throw new CrfModelFileError(`model uses feature set "${featureSet}"; this build computes "${CRF_FEATURE_SET}"`);
  const labels = field<string[]>(raw.labels, isStrings, 'labels');
  const attributes = field<string[]>(raw.attributes, isStrings, 'attributes');
  let featureStarts: Int32Array;
  let featureLabels: Uint16Array;
  let weights: Float64Array;
  try {
    featureStarts = int32Decode(field<string>(raw.featureStarts, isString, 'featureStarts'));
    featureLabels = uint16Decode(field<string>(raw.featureLabels, isString, 'featureLabels'));
    weights = float64Decode(field<string>(raw.weights, isString, 'weights'));
  } catch (error) {
    if (error instanceof CrfModelFileError) throw error;
    throw new CrfModelFileError(`model file: bad base64 data (${(error as Error).message})`);
  }
  const L = labels.length;
  const F = featureLabels.length;
  const consistent =
    L > 0 &&
    featureStarts.length === attributes.length + 1 &&
    featureStarts[0] === 0 &&
    featureStarts[attributes.length] === F &&
    featureStarts.every((v, i) => i === 0 || v >= (featureStarts[i - 1] as number)) &&
    featureLabels.every((y) => y < L) &&
    weights.length === F + L * L;
  if (!consistent) throw new CrfModelFileError('model file: feature tables and weights do not fit together');
  const training = field<CrfTrainingRecord>(raw.training, (v) => v !== null && typeof v === 'object', 'training');
  return { labels, attributes, featureStarts, featureLabels, weights, training };
}
