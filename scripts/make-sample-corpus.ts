// `npm run corpus`: regenerate sample-corpus/ from the seeded generator in scripts/corpus/.
import { mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { SAMPLE_CORPUS, sampleCorpusFiles } from './corpus/files';

const folder = fileURLToPath(new URL('../sample-corpus/', import.meta.url));
const files = sampleCorpusFiles();
mkdirSync(folder, { recursive: true });
// Remove files a previous generator wrote but this one no longer does, so the folder matches exactly.
const wanted = new Set(files.map((f) => f.name));
for (const name of readdirSync(folder)) if (!wanted.has(name)) rmSync(join(folder, name));
for (const file of files) writeFileSync(join(folder, file.name), file.content, 'utf8');
console.log(`sample-corpus/: ${files.length} files, ${SAMPLE_CORPUS.count} utterances, seed ${SAMPLE_CORPUS.seed}`);
