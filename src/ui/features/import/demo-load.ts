/**
 * The demo project: the invented sample corpus (served under /demo/ by the build, see vite.config.ts),
 * imported through the same worker pipeline as any file, one layer per annotator.
 */
import type { ProjectSchema } from '../../../core/backup/model';
import type { TokeniserSpec } from '../../../core/tokenise';
import { SCHEMES, type Scheme } from '../../../core/types';
import { projectCreate, projectDelete } from '../../../db';
import { appDb } from '../../app/db';
import { importJobId, importWorker } from './import-client';

export const DEMO_PROJECT_NAME = 'Home-repair demo';
export const DEMO_FILES: readonly { file: string; annotator: string }[] = [
  { file: 'ann-a.iob2', annotator: 'ann-a' },
  { file: 'ann-b.iob2', annotator: 'ann-b' },
];

interface CorpusSchema {
  scheme?: string;
  tokeniser?: TokeniserSpec;
  intents: { name: string; description?: string; slots?: string[] }[];
  slots: { name: string; description?: string }[];
}

/** sample-corpus/schema.json lists slots per intent; the project schema lists intents per slot. */
export function demoSchemaFromCorpus(corpus: CorpusSchema): ProjectSchema {
  return {
    intents: corpus.intents.map((i) => (i.description === undefined ? { name: i.name } : { name: i.name, description: i.description })),
    slots: corpus.slots.map((s) => {
      const intents = corpus.intents.filter((i) => i.slots?.includes(s.name) === true).map((i) => i.name);
      return { name: s.name, ...(s.description === undefined ? {} : { description: s.description }), ...(intents.length === 0 ? {} : { intents }) };
    }),
  };
}

async function demoFetch(name: string): Promise<Response> {
  const response = await fetch(`${import.meta.env.BASE_URL}demo/${name}`);
  if (!response.ok) throw new Error(`the demo file ${name} is missing from this build (${response.status})`);
  return response;
}

/** Create the demo project with both annotators' layers; returns its id. A failure leaves no half project. */
export async function demoLoad(): Promise<number> {
  const corpus = (await (await demoFetch('schema.json')).json()) as CorpusSchema;
  const scheme: Scheme = SCHEMES.find((s) => s === corpus.scheme) ?? 'iob2';
  const files = await Promise.all(DEMO_FILES.map(async (d) => new File([await (await demoFetch(d.file)).blob()], d.file)));
  const project = await projectCreate(appDb(), { name: DEMO_PROJECT_NAME, scheme, tokeniser: corpus.tokeniser ?? { kind: 'words' }, schema: demoSchemaFromCorpus(corpus) });
  try {
    for (const [i, d] of DEMO_FILES.entries()) {
      const request = { projectId: project.id, fileName: d.file, format: 'columns' as const, scheme, annotator: d.annotator, total: 0 };
      await importWorker().commit(files[i] as File, request, importJobId());
    }
  } catch (error) {
    await projectDelete(appDb(), project.id);
    throw error;
  }
  return project.id;
}
