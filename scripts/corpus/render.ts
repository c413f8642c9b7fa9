/** Fill a template into text segments, each either plain text or one slot value. */
import { CASE_STYLE_WEIGHTS, NOISE_RATES, caseApply, templateTextNoise, textTypos } from './noise';
import type { Random } from './random';
import type { CorpusSlot } from './schema';
import type { Template } from './templates';
import {
  EMOJI,
  GREETINGS,
  JOBS,
  POLITE_ENDINGS,
  areaValue,
  articleFor,
  bookingRefMake,
  budgetPhrase,
  dayPhrase,
  phoneMake,
  timePhrase,
  type Job,
} from './vocab';

export interface Segment {
  text: string;
  slot?: CorpusSlot;
}

export interface Rendered {
  segments: Segment[];
  typos: number;
}

const FILLER = /\{([a-z:]+)(\?)?\}/gu;

/** Split a phrase like "on the <3rd>" into plain and slot segments. */
export function phraseSegments(phrase: string, slot: CorpusSlot): Segment[] {
  const match = /^(.*)<(.+)>(.*)$/u.exec(phrase);
  if (match === null) return [{ text: phrase }];
  const [, before = '', value = '', after = ''] = match;
  return [{ text: before }, { text: value, slot }, { text: after }];
}

function fillerSegments(name: string, job: Job, rng: Random): Segment[] {
  switch (name) {
    case 'hi':
      return [{ text: rng.weighted(GREETINGS) }];
    case 'end': {
      const polite = rng.chance(NOISE_RATES.politeEnding) ? rng.weighted(POLITE_ENDINGS) : '';
      const emoji = rng.chance(NOISE_RATES.emojiEnding) ? ` ${rng.pick(EMOJI)}` : '';
      return [{ text: polite + emoji }];
    }
    case 'service':
      return [{ text: rng.pick(job.services), slot: 'service' }];
    case 'a:service': {
      const service = rng.pick(job.services);
      return [{ text: `${articleFor(service)} ` }, { text: service, slot: 'service' }];
    }
    case 'problem': {
      const problem = rng.pick(job.problems);
      const article = /^(an?) (.+)$/u.exec(problem);
      if (article === null) return [{ text: problem, slot: 'problem' }];
      return [{ text: `${article[1] ?? 'a'} ` }, { text: article[2] ?? problem, slot: 'problem' }];
    }
    case 'area':
      return [{ text: areaValue(rng), slot: 'area' }];
    case 'day':
    case 'day:bare':
      return phraseSegments(dayPhrase(rng, name === 'day:bare'), 'day');
    case 'time':
    case 'time:bare':
      return phraseSegments(timePhrase(rng, name === 'time:bare'), 'time_window');
    case 'budget':
      return phraseSegments(budgetPhrase(rng), 'budget');
    case 'phone':
      return [{ text: phoneMake(rng), slot: 'contact_phone' }];
    case 'ref':
      return [{ text: bookingRefMake(rng), slot: 'booking_ref' }];
    default:
      throw new Error(`template filler {${name}} is unknown`);
  }
}

/** Merge neighbouring plain segments and tidy their spaces; slot values never touch white space. */
function segmentsTidy(segments: readonly Segment[]): Segment[] {
  const merged: Segment[] = [];
  for (const segment of segments) {
    const last = merged[merged.length - 1];
    if (segment.slot === undefined && last !== undefined && last.slot === undefined) last.text += segment.text;
    else merged.push({ ...segment });
  }
  const out: Segment[] = [];
  merged.forEach((segment, i) => {
    if (segment.slot !== undefined) {
      out.push(segment);
      return;
    }
    let text = segment.text
      .replace(/\s+/gu, ' ')
      .replace(/ (?=[?.!,])/gu, '')
      .replace(/([?.!]),/gu, '$1');
    if (i === 0) text = text.trimStart();
    if (i === merged.length - 1) text = text.trimEnd();
    if (text.length > 0) out.push({ text });
  });
  return out;
}

/** Render one template with a coherent job (service and problem from the same trade). */
export function templateRender(template: Template, rng: Random): Rendered {
  const job = rng.pick(JOBS);
  const text = templateTextNoise(template.text, rng);
  const raw: Segment[] = [];
  let cursor = 0;
  for (const match of text.matchAll(FILLER)) {
    raw.push({ text: text.slice(cursor, match.index) });
    cursor = match.index + match[0].length;
    const [, name = '', optional] = match;
    if (optional === '?' && rng.chance(0.5)) continue;
    raw.push(...fillerSegments(name, job, rng));
  }
  raw.push({ text: text.slice(cursor) });

  const style = rng.weighted(CASE_STYLE_WEIGHTS);
  let typos = 0;
  const segments = segmentsTidy(raw).map((segment) => {
    const typoable = segment.slot !== 'contact_phone' && segment.slot !== 'booking_ref';
    const rate = segment.slot === undefined ? NOISE_RATES.typoOutsideSlot : NOISE_RATES.typoInsideSlot;
    const noisy = typoable ? textTypos(segment.text, rate, rng) : { text: segment.text, typos: 0 };
    typos += noisy.typos;
    return { ...segment, text: caseApply(noisy.text, style) };
  });
  const first = segments[0];
  if (style === 'sentence' && first !== undefined) first.text = first.text.charAt(0).toUpperCase() + first.text.slice(1);
  return { segments, typos };
}
