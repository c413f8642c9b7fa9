import type { ImportPreview } from '../../../workers/import-preview';

const FORMAT_NAMES: Record<string, string> = { columns: 'token and tag columns', jsonl: 'JSON Lines', text: 'plain text', csv: 'CSV', tsv: 'TSV' };

function plural(n: number, word: string): string {
  return `${n.toLocaleString('en')} ${word}${n === 1 ? '' : 's'}`;
}

function MoreNote({ shown, total }: { shown: number; total: number }) {
  return shown < total ? <p className="import-note">Showing the first {shown} of {total.toLocaleString('en')}.</p> : null;
}

export interface PreviewReportProps {
  preview: ImportPreview;
  labelsAdd: boolean;
  onLabelsAdd: (value: boolean) => void;
}

/** What the file holds, before anything is stored. */
export function PreviewReport({ preview, labelsAdd, onLabelsAdd }: PreviewReportProps) {
  const unknownCount = preview.unknownSlots.length + preview.unknownIntents.length;
  return (
    <section aria-labelledby="preview-title" className="import-preview">
      <h3 id="preview-title">What this file holds</h3>
      <dl className="import-counts">
        <dt>Utterances</dt>
        <dd data-testid="preview-utterances">{preview.utterances.toLocaleString('en')}</dd>
        <dt>Tokens</dt>
        <dd>{preview.tokens.toLocaleString('en')}</dd>
        <dt>Read as</dt>
        <dd>
          {FORMAT_NAMES[preview.format] ?? preview.format}, {preview.scheme.toUpperCase()} tags{preview.schemeDetected ? ' (detected)' : ''}
        </dd>
        <dt>Malformed lines</dt>
        <dd data-testid="preview-malformed">{preview.malformed.total.toLocaleString('en')}</dd>
        <dt>Illegal tag transitions</dt>
        <dd data-testid="preview-violations">{preview.violations.total.toLocaleString('en')}</dd>
        <dt>Repeated texts</dt>
        <dd>{preview.duplicates.total.toLocaleString('en')}</dd>
      </dl>

      {preview.malformed.total > 0 && (
        <div className="import-problem" role="alert">
          <h4>Lines that could not be read</h4>
          <p>Nothing can be stored from a file with unreadable lines. Fix these lines and pick the file again.</p>
          <ul aria-label="Malformed lines">
            {preview.malformed.lines.map((e) => (
              <li key={`${e.line}-${e.message}`}>
                Line {e.line}: {e.message}
              </li>
            ))}
          </ul>
          <MoreNote shown={preview.malformed.lines.length} total={preview.malformed.total} />
        </div>
      )}

      {preview.violations.total > 0 && (
        <div>
          <h4>Illegal tag transitions</h4>
          <p>These tags are stored exactly as they are, so they can be reviewed and repaired later.</p>
          <ul aria-label="Illegal tag transitions">
            {preview.violations.examples.map((v, i) => (
              <li key={i}>
                Line {v.line}: {v.message}
              </li>
            ))}
          </ul>
          <MoreNote shown={preview.violations.examples.length} total={preview.violations.total} />
        </div>
      )}

      {unknownCount > 0 && (
        <div>
          <h4>Labels this project does not list yet</h4>
          {preview.unknownSlots.length > 0 && <p>Slots: {preview.unknownSlots.map((s) => `${s.name} (${s.count})`).join(', ')}</p>}
          {preview.unknownIntents.length > 0 && <p>Intents: {preview.unknownIntents.map((s) => `${s.name} (${s.count})`).join(', ')}</p>}
          <label className="import-check">
            <input type="checkbox" checked={labelsAdd} onChange={(e) => onLabelsAdd(e.target.checked)} />
            Add these to the project&apos;s labels
          </label>
        </div>
      )}

      {preview.duplicates.total > 0 && (
        <div>
          <h4>Repeated texts</h4>
          <p>{plural(preview.duplicates.total, 'utterance')} repeat an earlier text exactly; all are kept.</p>
          <ul aria-label="Repeated texts">
            {preview.duplicates.examples.map((d) => (
              <li key={d.line}>
                Line {d.line} repeats line {d.firstLine}: “{d.text}”
              </li>
            ))}
          </ul>
          <MoreNote shown={preview.duplicates.examples.length} total={preview.duplicates.total} />
        </div>
      )}
    </section>
  );
}
