import type { DisagreementRow } from '../../../workers/agreement-run';
import { countText } from './agreement-format';

export function disagreementWhat(d: Pick<DisagreementRow, 'tokensDiffering' | 'intentDiffers'>): string {
  const tokens = d.tokensDiffering === 0 ? null : `${d.tokensDiffering} ${d.tokensDiffering === 1 ? 'token differs' : 'tokens differ'}`;
  const intent = d.intentDiffers ? 'intent differs' : null;
  return [tokens, intent].filter((p) => p !== null).join(', ');
}

/** Utterances where the two layers differ, most differing tokens first; each opens in the resolver. */
export function DisagreementList({ items, total, names, onOpen }: { items: DisagreementRow[]; total: number; names: [string, string]; onOpen: (d: DisagreementRow) => void }) {
  if (total === 0) return <p>The two layers agree on every utterance they share.</p>;
  return (
    <>
      <p>
        {countText(total)} {total === 1 ? 'utterance differs' : 'utterances differ'} between {names[0]} and {names[1]}
        {items.length < total ? `; the ${countText(items.length)} with the most differing tokens are listed.` : '.'}
      </p>
      <ol className="agreement-disagreements" aria-label="Disagreeing utterances">
        {items.map((d) => {
          const name = d.externalId ?? `#${d.utteranceId}`;
          return (
            <li key={d.utteranceId}>
              <button type="button" onClick={() => onOpen(d)} aria-label={`Resolve ${name}: ${disagreementWhat(d)}`}>
                Resolve
              </button>
              <span className="agreement-id">{name}</span>
              <span className="agreement-diff">{disagreementWhat(d)}</span>
              <span className="agreement-text">{d.text}</span>
            </li>
          );
        })}
      </ol>
    </>
  );
}
