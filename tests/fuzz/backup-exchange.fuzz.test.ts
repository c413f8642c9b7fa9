import { describe, it } from 'vitest';
import { layersText, layer, packText } from '../core/exchange/fixtures';
import { FUZZ_TIMEOUT, fuzzRuns } from './budget';
import { backupFuzzProperty, exchangeFuzzProperties } from './properties';

const packs = [await packText()];
const layers = [await layersText([layer(1), layer(4, { tags: ['O', 'B-day', 'I-day', 'O'], intent: 'cancel' }), layer(9)])];

describe('fuzz: backup, pack and layer readers', () => {
  const backup = backupFuzzProperty();
  it(backup.name, () => backup.run(fuzzRuns('backup')), FUZZ_TIMEOUT);
  const [pack, layer_] = exchangeFuzzProperties(packs, layers);
  if (pack === undefined || layer_ === undefined) throw new Error('exchange properties missing');
  it(pack.name, () => pack.run(fuzzRuns('pack')), FUZZ_TIMEOUT);
  it(layer_.name, () => layer_.run(fuzzRuns('layers')), FUZZ_TIMEOUT);
});
