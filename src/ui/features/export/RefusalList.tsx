import type { ExportRefusal } from '../../../workers/export-run';

const SHOWN_MAX = 200;

export interface RefusalListProps {
  violations: readonly ExportRefusal[];
  utterances: number;
  onAsIs: () => void;
  busy: boolean;
}

/** Why nothing was written: every illegal transition (up to a limit), and the explicit way past it. */
export function RefusalList({ violations, utterances, onAsIs, busy }: RefusalListProps) {
  const shown = violations.slice(0, SHOWN_MAX);
  return (
    <section aria-labelledby="refusal-title" className="refusal">
      <h3 id="refusal-title">Nothing written: illegal tag sequences</h3>
      <p>
        {violations.length} illegal transition{violations.length === 1 ? '' : 's'} in {utterances} utterance{utterances === 1 ? '' : 's'} of the chosen
        layers. Repair them first, or write them as they are.
      </p>
      <div className="table-scroll" role="region" aria-label="Illegal transitions" tabIndex={0}>
        <table>
          <caption className="visually-hidden">Illegal transitions in the chosen layers</caption>
          <thead>
            <tr>
              <th scope="col">Utterance</th>
              <th scope="col">Layer</th>
              <th scope="col">Token</th>
              <th scope="col">Tag</th>
              <th scope="col">Rule</th>
            </tr>
          </thead>
          <tbody>
            {shown.map((v) => (
              <tr key={`${v.seq}-${v.tokenIndex}`}>
                <td>{v.id ?? `#${v.seq}`}</td>
                <td>{v.annotator}</td>
                <td>
                  {v.token} <span className="muted">(token {v.tokenIndex + 1})</span>
                </td>
                <td>
                  <code>{v.tag === '' ? 'end' : v.tag}</code>
                </td>
                <td>{v.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {violations.length > shown.length && <p>… and {violations.length - shown.length} more not listed here.</p>}
      <p className="asis-note" id="asis-note">
        As they are: IOB2 keeps these tags exactly; BIOES and JSON Lines read a stray inside tag as the start of a new span, as the command line&apos;s
        convert does.
      </p>
      <button type="button" onClick={onAsIs} disabled={busy} aria-describedby="asis-note">
        Write them as they are
      </button>
    </section>
  );
}
