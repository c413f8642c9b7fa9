/**
 * The long fuzz run: `npm run fuzz -- [--seed N] [--count N] [--only TEXT]`. Runs every fuzz property
 * of tests/fuzz (the readers of src/core/formats, the backup reader, the pack and layer readers) with
 * `count` cases each (default 20,000) from `seed` (default: random, printed). A failure prints the
 * property, the seed and the replay path; add it to tests/fuzz/regressions.test.ts by name.
 */
import { layer, layersText, packText } from '../tests/core/exchange/fixtures';
import { backupFuzzProperty, exchangeFuzzProperties, neighbourProperties, READER_TARGETS, readerFuzzProperty, type FuzzProperty } from '../tests/fuzz/properties';

function argument(name: string): string | undefined {
  const at = process.argv.indexOf(`--${name}`);
  return at < 0 ? undefined : process.argv[at + 1];
}

const seed = Number(argument('seed') ?? Math.floor(Math.random() * 2 ** 31));
const count = Number(argument('count') ?? 20_000);
const only = argument('only');
if (!Number.isSafeInteger(seed) || !Number.isSafeInteger(count) || count < 1) {
  console.error('usage: npm run fuzz -- [--seed N] [--count N] [--only TEXT]');
  process.exit(2);
}

const properties: FuzzProperty[] = [
  ...READER_TARGETS.map(readerFuzzProperty),
  ...neighbourProperties(),
  backupFuzzProperty(),
  ...exchangeFuzzProperties([await packText()], [await layersText([layer(1), layer(4, { tags: ['O', 'B-day', 'I-day', 'O'], intent: 'cancel' }), layer(9)])]),
].filter((p) => only === undefined || p.name.includes(only));

console.log(`fuzz: seed ${seed}, ${count} cases for each of ${properties.length} properties`);
let failed = 0;
let cases = 0;
const started = performance.now();
for (const p of properties) {
  const t = performance.now();
  try {
    await p.run({ seed, numRuns: count });
    cases += count;
    console.log(`ok     ${p.name} (${((performance.now() - t) / 1000).toFixed(1)} s)`);
  } catch (error) {
    failed++;
    console.log(`FAILED ${p.name}\n${error instanceof Error ? error.message : String(error)}`);
  }
}
console.log(`fuzz: ${cases} cases passed, ${failed} properties failed, ${((performance.now() - started) / 1000).toFixed(1)} s, seed ${seed}`);
process.exit(failed === 0 ? 0 : 1);
