import { useLiveQuery } from 'dexie-react-hooks';
import { useId, useState, type FormEvent } from 'react';
import type { LayerStatus } from '../../../core/backup/model';
import { assignmentByAnnotator, assignmentPlan, assignmentProblem, type AssignmentPlan } from '../../../core/exchange';
import { annotatorList } from '../../../db/annotator-repo';
import { exchangeChoose, packsMake, type ExchangeChoice } from '../../../db/exchange-repo';
import { appDb } from '../../app/db';
import { annotatorIdsParse, overlapParse, packFileName, previewRows, STATUS_CHOICES, statusChoiceText, wholeParse } from './team-form';
import { useDownloads } from './use-downloads';

interface Preview {
  plan: AssignmentPlan<number>;
  key: string;
}

/** The lead's part: choose utterances and annotators, see who gets what, make one pack per annotator. */
export function PacksSection({ projectId, projectName }: { projectId: number; projectName: string }) {
  const id = useId();
  const known = useLiveQuery(() => annotatorList(appDb(), projectId), [projectId]) ?? [];
  const [which, setWhich] = useState<'all' | 'filter'>('all');
  const [filterAnnotator, setFilterAnnotator] = useState('');
  const [filterStatus, setFilterStatus] = useState<LayerStatus | 'none' | ''>('');
  const [sampling, setSampling] = useState(false);
  const [sampleSize, setSampleSize] = useState('100');
  const [annotators, setAnnotators] = useState('');
  const [overlap, setOverlap] = useState('20');
  const [seed, setSeed] = useState('1');
  const [suggestions, setSuggestions] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [busy, setBusy] = useState(false);
  const [links, linksSet] = useDownloads();
  const [made, setMade] = useState<string | null>(null);

  function formRead(): { choice: ExchangeChoice; ids: string[]; fraction: number; seedValue: number } | string {
    const { ids, problem: idsProblem } = annotatorIdsParse(annotators);
    if (idsProblem !== null) return idsProblem;
    const fraction = overlapParse(overlap);
    if (fraction === null) return 'The overlap must be a percentage from 0 to 100.';
    const seedValue = wholeParse(seed);
    if (seedValue === null) return 'The seed must be a whole number from 0 to 4294967295.';
    const choice: ExchangeChoice = {};
    if (which === 'filter') {
      if (filterAnnotator === '' && filterStatus === '') return 'Choose an annotator or a status to filter by.';
      if (filterAnnotator !== '') choice.annotator = filterAnnotator;
      if (filterStatus !== '') choice.status = filterStatus;
    }
    if (sampling) {
      const size = wholeParse(sampleSize, Number.MAX_SAFE_INTEGER);
      if (size === null || size === 0) return 'The sample size must be a whole number above 0.';
      choice.sample = { size, seed: seedValue };
    }
    return { choice, ids, fraction, seedValue };
  }

  const formKey = JSON.stringify([which, filterAnnotator, filterStatus, sampling, sampleSize, annotators, overlap, seed]);

  async function show(event: FormEvent) {
    event.preventDefault();
    setMade(null);
    linksSet([]);
    const form = formRead();
    if (typeof form === 'string') {
      setProblem(form);
      setPreview(null);
      return;
    }
    const seqs = await exchangeChoose(appDb(), projectId, form.choice);
    const planProblem = assignmentProblem(seqs.length, form.ids, form.fraction);
    if (planProblem !== null) {
      setProblem(planProblem);
      setPreview(null);
      return;
    }
    setProblem(null);
    setPreview({ plan: assignmentPlan(seqs, form.ids, form.fraction, form.seedValue), key: formKey });
  }

  async function make() {
    if (preview === null) return;
    setBusy(true);
    try {
      const packs = await packsMake(appDb(), projectId, assignmentByAnnotator(preview.plan), suggestions === '' ? {} : { suggestionsFrom: suggestions });
      linksSet(packs.map((p) => ({ name: packFileName(projectName, p.annotator), text: p.text, detail: `${p.count} utterance${p.count === 1 ? '' : 's'} for ${p.annotator}` })));
      setMade(`${packs.length} pack${packs.length === 1 ? '' : 's'} made. Save each and give it to its annotator.`);
    } catch (error) {
      setProblem(`The packs could not be made: ${(error as Error).message}`);
    } finally {
      setBusy(false);
    }
  }

  const stale = preview !== null && preview.key !== formKey;
  const rows = preview === null ? [] : previewRows(preview.plan);

  return (
    <section aria-labelledby={`${id}-title`}>
      <h3 id={`${id}-title`}>Hand out work in packs</h3>
      <form onSubmit={(e) => void show(e)} className="team-form">
        <fieldset>
          <legend>Which utterances</legend>
          <label>
            <input type="radio" name={`${id}-which`} checked={which === 'all'} onChange={() => setWhich('all')} /> All utterances
          </label>
          <label>
            <input type="radio" name={`${id}-which`} checked={which === 'filter'} onChange={() => setWhich('filter')} /> Only those whose layer matches
          </label>
          {which === 'filter' && (
            <span className="row-form">
              <label htmlFor={`${id}-fa`}>Layer of</label>
              <select id={`${id}-fa`} value={filterAnnotator} onChange={(e) => setFilterAnnotator(e.target.value)}>
                <option value="">anyone</option>
                {known.map((a) => (
                  <option key={a.id} value={a.id}>
                    {a.name === a.id ? a.id : `${a.name} (${a.id})`}
                  </option>
                ))}
              </select>
              <label htmlFor={`${id}-fs`}>with status</label>
              <select id={`${id}-fs`} value={filterStatus} onChange={(e) => setFilterStatus(e.target.value as LayerStatus | 'none' | '')}>
                <option value="">any</option>
                {STATUS_CHOICES.map((s) => (
                  <option key={s} value={s}>
                    {statusChoiceText(s)}
                  </option>
                ))}
              </select>
            </span>
          )}
          <span className="row-form">
            <label>
              <input type="checkbox" checked={sampling} onChange={(e) => setSampling(e.target.checked)} /> Only a random sample of
            </label>
            <input aria-label="Sample size" inputMode="numeric" size={6} value={sampleSize} onChange={(e) => setSampleSize(e.target.value)} disabled={!sampling} /> utterances
          </span>
        </fieldset>
        <div className="row-form">
          <label htmlFor={`${id}-ann`}>Annotators (ids, separated by commas)</label>
          <input id={`${id}-ann`} value={annotators} onChange={(e) => setAnnotators(e.target.value)} placeholder={known.map((a) => a.id).join(', ') || 'ana, ben'} size={30} />
        </div>
        <div className="row-form">
          <label htmlFor={`${id}-ov`}>Overlap (% of utterances given to two annotators)</label>
          <input id={`${id}-ov`} inputMode="decimal" size={5} value={overlap} onChange={(e) => setOverlap(e.target.value)} />
          <label htmlFor={`${id}-seed`}>Seed</label>
          <input id={`${id}-seed`} inputMode="numeric" size={10} value={seed} onChange={(e) => setSeed(e.target.value)} aria-describedby={`${id}-seed-note`} />
          <span id={`${id}-seed-note`} className="muted">
            The same seed gives the same sample and the same share-out again.
          </span>
        </div>
        <div className="row-form">
          <label htmlFor={`${id}-sug`}>Pre-fill suggestions from</label>
          <select id={`${id}-sug`} value={suggestions} onChange={(e) => setSuggestions(e.target.value)}>
            <option value="">nothing</option>
            <option value="model">model suggestions</option>
            <option value="gold">the resolved layer (gold)</option>
            {known.map((a) => (
              <option key={a.id} value={a.id}>
                {a.id}’s layer
              </option>
            ))}
          </select>
        </div>
        <button type="submit">Show who gets what</button>
      </form>
      {problem !== null && (
        <p role="alert" className="error">
          {problem}
        </p>
      )}
      {preview !== null && (
        <div className="team-preview">
          <p>
            {preview.plan.items.length} utterances; {preview.plan.doubles} of them go to two annotators.{stale && ' The form has changed since: show the plan again before making packs.'}
          </p>
          <table aria-label="Who gets what">
            <thead>
              <tr>
                <th scope="col">Annotator</th>
                <th scope="col">Utterances</th>
                <th scope="col">Shared with another annotator</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.annotator}>
                  <th scope="row">{r.annotator}</th>
                  <td>{r.total}</td>
                  <td>{r.shared}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {preview.plan.pairs.length > 0 && (
            <table aria-label="Shared utterances per pair">
              <thead>
                <tr>
                  <th scope="col">Pair</th>
                  <th scope="col">Shared utterances</th>
                </tr>
              </thead>
              <tbody>
                {preview.plan.pairs.map((p) => (
                  <tr key={`${p.a}|${p.b}`}>
                    <th scope="row">
                      {p.a} and {p.b}
                    </th>
                    <td>{p.count}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <button type="button" onClick={() => void make()} disabled={busy || stale}>
            {busy ? 'Making packs…' : 'Make the packs'}
          </button>
        </div>
      )}
      {made !== null && <p role="status">{made}</p>}
      {links.length > 0 && (
        <ul aria-label="Packs to save" className="team-files">
          {links.map((l) => (
            <li key={l.name}>
              <a href={l.url} download={l.name}>
                Save {l.name}
              </a>{' '}
              <span className="muted">({l.detail})</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
