import { useState } from 'react';
import type { RepairPreviewResult } from './rules-model';

// Drawn a page at a time: a thousand small tables at once would hold up the page.
const PAGE = 100;

interface Props {
  preview: RepairPreviewResult;
}

/** Before and after of every layer the repair changes; changed tags are marked with * as well as styled. */
export function RepairPreview({ preview }: Props) {
  const [shown, setShown] = useState(PAGE);
  const left = preview.layers.length - shown;
  return (
    <>
      <ol className="rules-preview" aria-label="Layers the repair changes" tabIndex={0}>
        {preview.layers.slice(0, shown).map(({ layer, after, changedAt }) => {
          const changed = new Set(changedAt);
          return (
            <li key={`${layer.utteranceId}|${layer.annotator}`}>
              <div className="rules-preview-title">
                Utterance {layer.seq}, layer {layer.annotator}: {changedAt.length} tag{changedAt.length === 1 ? '' : 's'} change
              </div>
              <div className="rules-preview-wrap" role="region" aria-label={`Before and after, utterance ${layer.seq}, ${layer.annotator}`} tabIndex={0}>
                <table className="rules-preview-grid">
                  <tbody>
                    <tr>
                      <th scope="row">Token</th>
                      {layer.words.map((w, i) => (
                        <td key={i}>{w}</td>
                      ))}
                    </tr>
                    <tr>
                      <th scope="row">Before</th>
                      {layer.tags.map((t, i) => (
                        <td key={i} className={changed.has(i) ? 'changed' : undefined}>
                          <code>{t}</code>
                        </td>
                      ))}
                    </tr>
                    <tr>
                      <th scope="row">After</th>
                      {after.map((t, i) => (
                        <td key={i} className={changed.has(i) ? 'changed' : undefined}>
                          <code>{t}</code>
                          {changed.has(i) ? ' *' : ''}
                        </td>
                      ))}
                    </tr>
                  </tbody>
                </table>
              </div>
            </li>
          );
        })}
      </ol>
      {left > 0 && (
        <button type="button" onClick={() => setShown((n) => n + PAGE)}>
          Show {Math.min(PAGE, left)} more of the {left} not shown yet
        </button>
      )}
    </>
  );
}
