import type { ContextToken } from '../../../core/adjudication';
import type { FindingRow } from './rules-model';

interface Props {
  rows: FindingRow[];
  selected: ReadonlySet<string>;
  onToggle: (layerKey: string, on: boolean) => void;
  onPreviewOne: (layerKey: string) => void;
}

/** The tokens around a finding: the offending token and the one before it are marked in words too. */
function Context({ tokens, marked }: { tokens: ContextToken[]; marked: readonly number[] }) {
  return (
    <span className="rules-context">
      {tokens.map((t) => (
        <span key={t.index} className={marked.includes(t.index) ? 'rules-token marked' : 'rules-token'}>
          {t.focus ? '▶ ' : ''}
          {t.word} <code>{t.tag}</code>
        </span>
      ))}
    </span>
  );
}

export function FindingsTable({ rows, selected, onToggle, onPreviewOne }: Props) {
  return (
    <div className="rules-table-wrap" role="region" aria-label="Rule findings" tabIndex={0}>
      <table className="rules-table">
        <thead>
          <tr>
            <th scope="col">Select</th>
            <th scope="col">Utterance</th>
            <th scope="col">Layer</th>
            <th scope="col">Where (tokens with their tags; ▶ marks the token at fault, a frame what it concerns)</th>
            <th scope="col">Rule</th>
            <th scope="col">Repair</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => {
            const name = `utterance ${row.layer.seq}, ${row.layer.annotator}: ${row.finding.message}`;
            return (
              <tr key={row.id}>
                <td>
                  <input type="checkbox" aria-label={`Select ${name}`} checked={selected.has(row.layerKey)} onChange={(e) => onToggle(row.layerKey, e.target.checked)} />
                </td>
                <td>{row.layer.seq}</td>
                <td>{row.layer.annotator}</td>
                <td>{row.finding.index === null ? <span>intent {row.layer.intent ?? 'none'}</span> : <Context tokens={row.context} marked={row.marked} />}</td>
                <td>
                  <div>{row.finding.message}</div>
                  <div className="muted">{row.rule}</div>
                </td>
                <td>
                  {row.repairable === 'never' ? (
                    <span className="muted">Not by repair: pick a listed intent on the label screen, or add it to the schema.</span>
                  ) : (
                    <button type="button" onClick={() => onPreviewOne(row.layerKey)} aria-label={`Preview the repair of ${name}`}>
                      Preview repair
                    </button>
                  )}
                  {row.repairable === 'schema-option' && <div className="muted">needs “drop spans the schema does not allow”</div>}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
