/** The committed sample corpus as file names and contents, built in memory so tests can compare bytes. */
import { columnsWrite, jsonlWrite } from '../../src/core/formats';
import { corpusGenerate, type Corpus } from './generate';
import { corpusReadme } from './readme';
import { corpusSchemaJson } from './schema';

/** Settings of the committed sample; change them and run `npm run corpus` to regenerate. */
export const SAMPLE_CORPUS = { seed: 20_417, count: 2000, overlapShare: 0.2 } as const;

export interface CorpusFile {
  name: string;
  content: string;
}

function linesJoin(lines: readonly string[]): string {
  return lines.length === 0 ? '' : `${lines.join('\n')}\n`;
}

/** Every file of a corpus folder, in a fixed order. */
export function corpusFiles(corpus: Corpus): CorpusFile[] {
  const files: CorpusFile[] = [
    { name: 'utterances.txt', content: linesJoin(corpus.truth.map((u) => u.text)) },
    { name: 'truth.iob2', content: columnsWrite(corpus.truth) },
    { name: 'truth.jsonl', content: jsonlWrite(corpus.truth) },
  ];
  for (const layer of corpus.layers) {
    files.push({ name: `${layer.annotator}.iob2`, content: columnsWrite(layer.utterances) });
    files.push({ name: `${layer.annotator}.jsonl`, content: jsonlWrite(layer.utterances) });
  }
  files.push({ name: 'overlap-ids.txt', content: linesJoin(corpus.overlapIds) });
  files.push({ name: 'schema.json', content: `${JSON.stringify(corpusSchemaJson(), null, 2)}\n` });
  files.push({ name: 'README.md', content: corpusReadme(corpus) });
  return files;
}

/** The files of the committed sample corpus, generated afresh. */
export function sampleCorpusFiles(): CorpusFile[] {
  return corpusFiles(corpusGenerate(SAMPLE_CORPUS));
}
