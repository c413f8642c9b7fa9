import type { AdjudicationDiff } from '../../../core/adjudication';

interface Row {
  label: string;
  tags: readonly string[];
}

interface Props {
  words: readonly string[];
  rows: Row[];
  diff: AdjudicationDiff;
  regionOf: readonly number[];
  /** 1-based number of the current region, 0 when the intent (or nothing) is current. */
  current: number;
  selection: { from: number; to: number } | null;
  /** Null when tokens cannot be selected (read-only). */
  onToken: ((index: number, extend: boolean) => void) | null;
}

/**
 * The layers token by token, one column per token. Disputed tokens carry their disagreement number
 * in a row of its own and a marked border, so the difference never rests on colour alone.
 */
export function TokenGrid({ words, rows, regionOf, current, selection, onToken }: Props) {
  const selected = (i: number) => selection !== null && i >= selection.from && i <= selection.to;
  const cellClass = (i: number) => {
    const region = regionOf[i] ?? 0;
    return [region > 0 ? 'disputed' : '', region > 0 && region === current ? 'current' : '', selected(i) ? 'selected' : ''].filter(Boolean).join(' ');
  };
  return (
    <div className="resolve-grid-wrap" role="region" aria-label="Layers token by token" tabIndex={0}>
      <table className="resolve-grid">
        <caption className="resolve-sr-only">Each token with the tag every layer gives it; disputed tokens are numbered by disagreement.</caption>
        <thead>
          <tr>
            <th scope="row">Token</th>
            {words.map((w, i) => (
              <th key={i} scope="col" className={cellClass(i)}>
                {onToken === null ? (
                  <span className="resolve-word">{w}</span>
                ) : (
                  <button type="button" className="resolve-word" aria-pressed={selected(i)} aria-label={`Token ${i + 1}: ${w}`} onClick={(e) => onToken(i, e.shiftKey)}>
                    {w}
                  </button>
                )}
                <span className="resolve-index" aria-hidden="true">
                  {i + 1}
                </span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">Disputed</th>
            {words.map((_, i) => {
              const region = regionOf[i] ?? 0;
              return (
                <td key={i} className={cellClass(i)}>
                  {region === 0 ? '' : `${region === current ? '▶ ' : ''}#${region}`}
                </td>
              );
            })}
          </tr>
          {rows.map((row) => (
            <tr key={row.label}>
              <th scope="row">{row.label}</th>
              {words.map((_, i) => (
                <td key={i} className={cellClass(i)}>
                  <code>{row.tags[i] ?? ''}</code>
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
