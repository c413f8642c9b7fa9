import type { AgreementReport } from '../../../core/agreement';
import { countText, figureText, kappaBand } from './agreement-format';

/** With three or more layers: Fleiss' kappa, Krippendorff's alpha and the pairwise kappa matrix. */
export function MultiFigures({ report }: { report: AgreementReport }) {
  const { fleissKappa, alpha, pairwise } = report;
  if (fleissKappa === undefined || alpha === undefined || pairwise === undefined) return null;
  const fleiss = fleissKappa.slot;
  const a = alpha.slot;
  return (
    <section aria-labelledby="agreement-multi-title">
      <h3 id="agreement-multi-title">All {report.layers.length} layers together</h3>
      <dl className="agreement-multi">
        <dt>Fleiss’ kappa, slot types</dt>
        <dd data-testid="figure-fleiss">
          {figureText(fleiss.value)} {fleiss.value !== null && `(${kappaBand(fleiss)})`} over {countText(fleiss.n)} tokens of the {countText(fleiss.utterances)} utterances every layer holds
          {fleiss.reason !== undefined && ` — ${fleiss.reason}`}
        </dd>
        <dt>Krippendorff’s alpha, slot types (nominal)</dt>
        <dd data-testid="figure-alpha">
          {figureText(a.value)} over {countText(a.units)} tokens held by two or more layers
          {a.reason !== undefined && ` — ${a.reason}`}
        </dd>
      </dl>
      <table className="agreement-pairwise">
        <caption>Slot kappa of each pair of layers</caption>
        <thead>
          <tr>
            <td />
            {pairwise.layers.map((l) => (
              <th key={l} scope="col">
                {l}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {pairwise.layers.map((row, i) => (
            <tr key={row}>
              <th scope="row">{row}</th>
              {pairwise.layers.map((column, j) => (
                <td key={column} title={`${countText(pairwise.tokens[i]?.[j] ?? 0)} tokens compared`}>
                  {i === j ? '—' : figureText(pairwise.kappa[i]?.[j] ?? null)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
