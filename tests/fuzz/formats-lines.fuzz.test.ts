import { describe, it } from 'vitest';
import { FUZZ_TIMEOUT, fuzzRuns } from './budget';
import { READER_TARGETS, readerFuzzProperty } from './properties';

describe('fuzz: columns and JSON Lines readers (bytes and text, whole and chunked)', () => {
  for (const target of READER_TARGETS.filter((t) => t.name.startsWith('columns') || t.name === 'jsonl')) {
    const { name, run } = readerFuzzProperty(target);
    it(name, () => run(fuzzRuns(target.name)), FUZZ_TIMEOUT);
  }
});
