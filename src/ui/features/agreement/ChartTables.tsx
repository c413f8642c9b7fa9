/** The charts' text alternatives: the same figures as tables, folded away under each chart. */
import type { SlotFigures } from '../../../core/agreement';
import type { TimePoint } from '../../../workers/agreement-time';
import { countText, figureText, timeText } from './agreement-format';
import { slotRows } from './charts/SlotBars';
import { LazyDetails } from './LazyDetails';

export function SlotTable({ perSlot, names }: { perSlot: Record<string, SlotFigures>; names: [string, string] }) {
  return (
    <LazyDetails className="chart-table" summary="Per-slot figures as a table">
      {() => (
      <table>
        <caption>Per-slot agreement</caption>
        <thead>
          <tr>
            <th scope="col">Slot</th>
            <th scope="col">Token kappa</th>
            <th scope="col">Span F1, exact</th>
            <th scope="col">Spans of {names[0]}</th>
            <th scope="col">Spans of {names[1]}</th>
            <th scope="col">Exact matches</th>
          </tr>
        </thead>
        <tbody>
          {slotRows(perSlot).map(([slot, f]) => (
            <tr key={slot}>
              <th scope="row">{slot}</th>
              <td>{figureText(f.kappa.value)}</td>
              <td>{figureText(f.exactF1)}</td>
              <td>{countText(f.a)}</td>
              <td>{countText(f.b)}</td>
              <td>{countText(f.exactMatched)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      )}
    </LazyDetails>
  );
}

export function ConfusionTable({ labels, counts, names }: { labels: string[]; counts: number[][]; names: [string, string] }) {
  return (
    <LazyDetails className="chart-table" summary="Token counts as a table">
      {() => (
      <table>
        <caption>
          Tokens by slot type: rows {names[0]}, columns {names[1]}
        </caption>
        <thead>
          <tr>
            <th scope="col">
              {names[0]} \ {names[1]}
            </th>
            {labels.map((l) => (
              <th key={l} scope="col">
                {l}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {labels.map((row, i) => (
            <tr key={row}>
              <th scope="row">{row}</th>
              {labels.map((column, j) => (
                <td key={column}>{countText(counts[i]?.[j] ?? 0)}</td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      )}
    </LazyDetails>
  );
}

export function TimeTable({ points }: { points: TimePoint[] }) {
  return (
    <LazyDetails className="chart-table" summary="Agreement over time as a table">
      {() => (
      <table>
        <caption>Slot kappa as layers were completed</caption>
        <thead>
          <tr>
            <th scope="col">Completed by (UTC)</th>
            <th scope="col">Utterances</th>
            <th scope="col">Tokens</th>
            <th scope="col">Slot kappa</th>
          </tr>
        </thead>
        <tbody>
          {points.map((p) => (
            <tr key={p.time}>
              <th scope="row">{timeText(p.time)}</th>
              <td>{countText(p.utterances)}</td>
              <td>{countText(p.tokens)}</td>
              <td>{figureText(p.kappa)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      )}
    </LazyDetails>
  );
}
