import { describe, it } from 'vitest';
import { FUZZ_TIMEOUT, fuzzRuns } from './budget';
import { neighbourProperties } from './properties';

const KEYS = ['columns neighbours', 'jsonl neighbours', 'csv neighbours'];

describe('fuzz: good utterances next to bad input', () => {
  neighbourProperties().forEach(({ name, run }, i) => it(name, () => run(fuzzRuns(KEYS[i] ?? '')), FUZZ_TIMEOUT));
});
