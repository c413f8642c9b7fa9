import { describe, expect, it } from 'vitest';
import { exportFormDefault, exportFormRequest, exportReportText, type ExportForm } from '../../../../src/ui/features/export/export-form';

const form = (patch: Partial<ExportForm> = {}): ExportForm => ({ ...exportFormDefault(false, 'ann-a'), ...patch });

describe('exportFormRequest', () => {
  it('defaults to done layers of one annotator, one IOB2 file, no masking', () => {
    expect(exportFormRequest(form(), 3)).toEqual({
      request: { projectId: 3, policy: { kind: 'annotator', annotator: 'ann-a' }, statuses: ['done'], format: 'iob2', mask: [], asIs: false },
    });
    expect(exportFormDefault(true, 'ann-a').policy).toBe('gold');
  });

  it('builds gold and gold-else policies, statuses in fixed order, masking and as-is', () => {
    const built = exportFormRequest(form({ policy: 'gold-else', statuses: ['flagged', 'done'], maskDigits: true, maskEmail: true, format: 'jsonl' }), 1, true);
    expect(built).toEqual({
      request: { projectId: 1, policy: { kind: 'gold-else', annotator: 'ann-a' }, statuses: ['done', 'flagged'], format: 'jsonl', mask: ['digits', 'email'], asIs: true },
    });
    expect(exportFormRequest(form({ policy: 'gold', annotator: '' }), 1)).toMatchObject({ request: { policy: { kind: 'gold' } } });
  });

  it('refuses a missing annotator, no status, and bad split numbers, in words', () => {
    expect(exportFormRequest(form({ annotator: '' }), 1)).toEqual({ problem: 'Choose whose labels to write: this project has no annotator yet.' });
    expect(exportFormRequest(form({ statuses: [] }), 1)).toEqual({ problem: 'Tick at least one status to write.' });
    expect(exportFormRequest(form({ split: true, train: '0.7' }), 1)).toEqual({ problem: 'Split: the ratios must add up to 1, they add up to 0.8999999999999999.' });
    expect(exportFormRequest(form({ split: true, dev: '' }), 1)).toEqual({ problem: 'Split: the dev ratio must be a number of at least 0, got NaN.' });
    expect(exportFormRequest(form({ split: true, seed: '1.5' }), 1)).toEqual({ problem: 'Split: the seed must be a whole number, got 1.5.' });
  });

  it('passes a valid split through as numbers', () => {
    expect(exportFormRequest(form({ split: true, train: '0.6', dev: '0.2', test: '0.2', seed: '42' }), 1)).toMatchObject({
      request: { split: { ratios: { train: 0.6, dev: 0.2, test: 0.2 }, seed: 42 } },
    });
  });
});

describe('exportReportText', () => {
  it('says how many were chosen and why the others were left out', () => {
    const filteredByStatus = { unlabelled: 0, draft: 3, done: 0, skipped: 0, flagged: 1 };
    expect(exportReportText({ total: 10, kept: 4, missingLayer: 2, filteredByStatus })).toBe(
      '4 of 10 utterances chosen. Left out: 2 without a layer of the chosen kind, 3 marked draft, 1 marked flagged.',
    );
    expect(exportReportText({ total: 1, kept: 1, missingLayer: 0, filteredByStatus: { ...filteredByStatus, draft: 0, flagged: 0 } })).toBe('1 of 1 utterance chosen.');
  });
});
