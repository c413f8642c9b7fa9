/**
 * Fixed-seed case counts for `npm test`: 100,000 in all, spread over four files so vitest runs them
 * on both cores. The long run is `npm run fuzz -- --seed N --count N` (scripts/fuzz.ts).
 */
export const FUZZ_SEED = 42;

export const FUZZ_CASES: Readonly<Record<string, number>> = {
  columns: 10_000,
  'columns (iob2, no token ranges)': 10_000,
  jsonl: 12_000,
  text: 8_000,
  csv: 10_000,
  tsv: 8_000,
  'tsv by index, no header': 8_000,
  'columns neighbours': 6_000,
  'jsonl neighbours': 6_000,
  'csv neighbours': 6_000,
  backup: 8_000,
  pack: 4_000,
  layers: 4_000,
};

export function fuzzRuns(key: string): { seed: number; numRuns: number } {
  const numRuns = FUZZ_CASES[key];
  if (numRuns === undefined) throw new Error(`no fuzz budget for ${key}`);
  return { seed: FUZZ_SEED, numRuns };
}

/** Per property: about 20 s on an idle two-core machine, several times that on a loaded one. */
export const FUZZ_TIMEOUT = 300_000;
