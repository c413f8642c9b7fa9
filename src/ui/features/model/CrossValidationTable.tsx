import type { CrossValidation } from '../../../core/crf';
import { crossValidationReading, SLOT_F1_WEAK, slotRows } from './model-reading';

const f = (x: number) => x.toFixed(2);

/** Span figures per slot, pooled over the folds (a span counts only with the exact slot and token range). */
export function CrossValidationTable({ cv }: { cv: CrossValidation }) {
  const rows = slotRows(cv);
  const o = cv.pooled.overall;
  return (
    <section aria-labelledby="model-cv-title" className="model-section">
      <h3 id="model-cv-title">How well it labels unseen utterances</h3>
      <p className="model-reading">{crossValidationReading(cv)}</p>
      <div className="model-table-wrap">
        <table className="model-table" aria-label="Span F1 per slot">
          <caption>
            {cv.folds}-fold cross-validation over {cv.pooled.utterances.toLocaleString('en')} utterances; a span is right only when slot and tokens match exactly (the CoNLL-2000 rule).
          </caption>
          <thead>
            <tr>
              <th scope="col">Slot</th>
              <th scope="col">Labelled spans</th>
              <th scope="col">Precision</th>
              <th scope="col">Recall</th>
              <th scope="col">F1</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.slot} className={r.support > 0 && r.f1 < SLOT_F1_WEAK ? 'model-weak' : undefined}>
                <th scope="row">{r.slot}</th>
                <td>{r.support}</td>
                <td>{f(r.precision)}</td>
                <td>{f(r.recall)}</td>
                <td>{f(r.f1)}</td>
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr>
              <th scope="row">All slots</th>
              <td>{o.truePositives + o.falseNegatives}</td>
              <td>{f(o.precision)}</td>
              <td>{f(o.recall)}</td>
              <td>{f(o.f1)}</td>
            </tr>
          </tfoot>
        </table>
      </div>
    </section>
  );
}
