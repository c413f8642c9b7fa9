import type { FindingLocation } from '../../../core/error-detect';
import type { ScanUtterance } from '../../../workers/findings-run';
import { competingReadings, findingHeadline, KIND_TEXT, placeContext, type FindingItem } from './mistakes-model';

interface Props {
  item: FindingItem;
  utterances: Readonly<Record<string, ScanUtterance>>;
  labelHref: (location: FindingLocation) => string;
  onOpen: (location: FindingLocation) => void;
  onDismiss: (item: FindingItem) => void;
  onRestore: (item: FindingItem) => void;
  busy: boolean;
}

function Place({ location, utterance, href, onOpen }: { location: FindingLocation; utterance: ScanUtterance; href: string; onOpen: () => void }) {
  const context = placeContext(utterance, location);
  return (
    <li>
      <a
        href={href}
        onClick={(event) => {
          event.preventDefault();
          onOpen();
        }}
      >
        utterance {utterance.seq} ({location.layer})
      </a>
      : <span className="mistake-context">
        {context.before} <mark>{context.focus}</mark> {context.after}
      </span>
    </li>
  );
}

/** One finding: its words, the labels that compete with their counts, the places (each opens in Label), and dismiss. */
export function FindingCard({ item, utterances, labelHref, onOpen, onDismiss, onRestore, busy }: Props) {
  const { finding } = item;
  const headline = findingHeadline(finding);
  const readings = competingReadings(finding);
  const name = `${KIND_TEXT[finding.kind].short} ${item.rank}, “${headline}”`;
  return (
    <li className={item.dismissed ? 'mistake is-dismissed' : 'mistake'}>
      <p className="mistake-head">
        <span className="mistake-rank">{item.rank}.</span> <span className="mistake-words">{headline}</span>
        {item.dismissed && <span className="mistake-flag"> (dismissed)</span>}
      </p>
      <ul className="mistake-readings" aria-label={`Labels given: ${name}`}>
        {readings.map((reading, i) => (
          <li key={i}>
            <span className="mistake-count">{reading.count.toLocaleString('en')} ×</span> {reading.label}
            {reading.places.length > 0 && (
              <ul className="mistake-places">
                {reading.places.map((location) => {
                  const utterance = utterances[location.id];
                  if (utterance === undefined) return null;
                  return <Place key={`${location.id}/${location.layer}/${location.start}`} location={location} utterance={utterance} href={labelHref(location)} onOpen={() => onOpen(location)} />;
                })}
                {reading.count > reading.places.length && <li className="muted">and {(reading.count - reading.places.length).toLocaleString('en')} more</li>}
              </ul>
            )}
          </li>
        ))}
      </ul>
      {item.dismissed ? (
        <button type="button" disabled={busy} onClick={() => onRestore(item)} aria-label={`Bring back ${name}`}>
          Bring back
        </button>
      ) : (
        <button type="button" disabled={busy} onClick={() => onDismiss(item)} aria-label={`Dismiss ${name}`}>
          Dismiss
        </button>
      )}
    </li>
  );
}
