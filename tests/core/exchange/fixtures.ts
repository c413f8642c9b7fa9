/** Small invented exchange files of the home-repair scenario, for the codec and merge tests. */
import type { ProjectInfo } from '../../../src/core/backup/model';
import type { LayerRecord, PackUtterance } from '../../../src/core/exchange/model';
import { layersWrite } from '../../../src/core/exchange/layers';
import { packWrite } from '../../../src/core/exchange/pack';

export const UID = '0123456789abcdef0123456789abcdef';
export const PROJECT = { uid: UID, name: 'Boiler jobs' };
export const SETUP: ProjectInfo = {
  name: 'Boiler jobs',
  created: 1_700_000_000_000,
  updated: 1_700_000_100_000,
  tokeniser: { kind: 'words' },
  scheme: 'iob2',
  schema: {
    slots: [
      { name: 'service', key: 's', description: 'The trade asked for, e.g. plumber.', examples: ['plumber', 'electrician'] },
      { name: 'day', description: 'A day or date.' },
    ],
    intents: [{ name: 'book_visit', description: 'Asks for a visit.' }, { name: 'cancel' }],
  },
};

export const UTTERANCES: PackUtterance[] = [
  { seq: 1, externalId: 'hr-001', text: 'book a plumber for Friday', tokens: [0, 4, 5, 6, 7, 14, 15, 18, 19, 25], meta: {} },
  { seq: 4, text: 'cancel the visit 🔧', tokens: [0, 6, 7, 10, 11, 16, 17, 19], meta: { source: 'web' }, suggestion: { tags: ['O', 'O', 'O', 'O'], intent: 'cancel' } },
  { seq: 9, externalId: 'hr-009', text: 'תקנו את הברז', tokens: [0, 4, 5, 7, 8, 12], meta: {} },
];

export function packText(): Promise<string> {
  return packWrite({ created: '2025-03-14T09:30:00.000Z', project: PROJECT, annotator: { id: 'ana', name: 'Ana' }, setup: SETUP, suggestionsFrom: 'model', utterances: UTTERANCES });
}

export function layer(seq: number, over: Partial<LayerRecord> = {}): LayerRecord {
  const u = UTTERANCES.find((x) => x.seq === seq);
  const tokenCount = (u?.tokens.length ?? 0) / 2;
  const base: LayerRecord = { seq, tokenCount, annotator: 'ana', tags: new Array<string>(tokenCount).fill('O'), intent: null, status: 'done', note: '', revision: 1, updated: 1_700_000_200_000 };
  if (u?.externalId !== undefined) base.externalId = u.externalId;
  return { ...base, ...over };
}

export function layersText(layers: LayerRecord[], annotator = 'ana', project = PROJECT): Promise<string> {
  return layersWrite({ created: '2025-03-15T10:00:00.000Z', project, annotator, pack: 'ab'.repeat(32), layers });
}

/** Replace line `n` (1-based) of `text`. */
export function lineEdit(text: string, n: number, edit: (line: string) => string): string {
  const lines = text.split('\n');
  lines[n - 1] = edit(lines[n - 1] as string);
  return lines.join('\n');
}
