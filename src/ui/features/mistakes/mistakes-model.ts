/** What the likely-mistakes screen shows, as plain data: filters, groups, competing labels, places in context. */
import { ANNOTATOR_GOLD } from '../../../core/backup/model';
import { type Finding, type FindingKind, type FindingLocation } from '../../../core/error-detect';
import { spansFromTags } from '../../../core/schemes';
import { FINDING_KINDS, LOCATIONS_SHOWN } from '../../../workers/findings-choose';
import type { FindingsScan, ScanUtterance } from '../../../workers/findings-run';

export interface MistakesFilter {
  kind: FindingKind | 'all';
  showDismissed: boolean;
}

/** Filter state lives in the URL (`?kind=identical&dismissed=shown`); unknown values read as the default. */
export function mistakesFilterFromQuery(query: Readonly<Record<string, string>>): MistakesFilter {
  const kind = FINDING_KINDS.find((k) => k === query.kind) ?? 'all';
  return { kind, showDismissed: query.dismissed === 'shown' };
}

export function mistakesFilterToQuery(filter: MistakesFilter, query: Readonly<Record<string, string>> = {}): Record<string, string> {
  const { kind: _kind, dismissed: _dismissed, ...rest } = query;
  return { ...rest, ...(filter.kind === 'all' ? {} : { kind: filter.kind }), ...(filter.showDismissed ? { dismissed: 'shown' } : {}) };
}

export const KIND_TEXT: Record<FindingKind, { title: string; short: string; about: string }> = {
  variation: {
    short: 'varying stretch',
    title: 'Same words, labelled differently',
    about:
      'A stretch of words that comes back with the same words around it, but not with the same labels (variation n-grams, after Dickinson and Meurers 2003). ' +
      'Listed first: differences with the same words on both sides, then longer shared stretches, then the most frequent.',
  },
  identical: {
    short: 'repeated utterance',
    title: 'Same utterance, different labels',
    about: 'Utterances with the same words (ignoring case) whose slots or intent differ. Listed first: a lone copy that differs from many copies that agree.',
  },
  'slot-outlier': {
    short: 'unusual slot',
    title: 'A value under an unusual slot',
    about: 'A value labelled as one slot a few times but at least ten times as often (and at least five times) as another slot. Listed first: the largest gap.',
  },
  'model-disagreement': {
    short: 'model disagreement',
    title: 'The model is sure of something else',
    about:
      "Where the project's saved model is at least 90 % sure, on every word of the stretch, of labels that differ from the layer's. The model learned from labels like these, " +
      'so where it still disagrees with confidence, the label is often a slip. Listed first: the surest.',
  },
};

export interface FindingItem {
  key: string;
  /** 1-based place in the core's ranking within its kind, before any filter. */
  rank: number;
  dismissed: boolean;
  finding: Finding;
}

export interface FindingGroup {
  kind: FindingKind;
  items: FindingItem[];
  total: number;
  dismissed: number;
}

/** Findings grouped by kind, ranks kept; dismissed ones hidden unless asked for. Every kind gets a group (maybe empty). */
export function findingGroups(scan: FindingsScan, dismissed: ReadonlySet<string>, filter: MistakesFilter): FindingGroup[] {
  const kinds = filter.kind === 'all' ? FINDING_KINDS : [filter.kind];
  return kinds.map((kind) => {
    const all = scan.findings.filter((f) => f.finding.kind === kind).map((f, i): FindingItem => ({ key: f.key, rank: i + 1, dismissed: dismissed.has(f.key), finding: f.finding }));
    const hidden = all.filter((item) => item.dismissed).length;
    return { kind, items: filter.showDismissed ? all : all.filter((item) => !item.dismissed), total: all.length, dismissed: hidden };
  });
}

/** Slots of a tag sequence in words, e.g. `service “plumber”, day “friday”`; `words` align with `tags`. */
export function spansText(words: readonly string[], tags: readonly string[]): string {
  const spans = spansFromTags(tags);
  if (spans.length === 0) return 'no slot';
  return spans.map((s) => `${s.slot} “${words.slice(s.start, s.end).join(' ')}”`).join(', ');
}

export interface CompetingReading {
  /** The labels in words. */
  label: string;
  count: number;
  /** The first places with this reading (LOCATIONS_SHOWN at most); `count` says how many there are. */
  places: FindingLocation[];
}

/** The competing labels of a finding, each with how often it was given; the likeliest right one first. */
export function competingReadings(finding: Finding): CompetingReading[] {
  switch (finding.kind) {
    case 'variation': {
      const { start, end } = finding.nucleus;
      const words = finding.tokens.slice(start, end);
      return finding.readings.map((r) => ({ label: spansText(words, r.tags.slice(start, end)) + ` (tags ${r.tags.slice(start, end).join(' ')})`, count: r.locations.length, places: r.locations.slice(0, LOCATIONS_SHOWN) }));
    }
    case 'identical':
      return finding.readings.map((r) => ({ label: `${spansText(finding.tokens, r.tags)}; intent ${r.intent ?? 'none'}`, count: r.locations.length, places: r.locations.slice(0, LOCATIONS_SHOWN) }));
    case 'slot-outlier':
      return [
        { label: `slot ${finding.majoritySlot}`, count: finding.majorityCount, places: [] },
        { label: `slot ${finding.slot}`, count: finding.count, places: finding.locations.slice(0, LOCATIONS_SHOWN) },
      ];
    case 'model-disagreement':
      return [
        { label: `the model: ${spansText(finding.tokens, finding.modelTags)} (at least ${Math.floor(finding.confidence * 100)} % sure)`, count: 1, places: [] },
        { label: `${finding.location.layer}: ${spansText(finding.tokens, finding.annotatorTags)}`, count: 1, places: [finding.location] },
      ];
  }
}

/** The finding's words in one line: the varying stretch, the utterance, the value or the stretch. */
export function findingHeadline(finding: Finding): string {
  switch (finding.kind) {
    case 'variation': {
      const { start, end } = finding.nucleus;
      const before = finding.tokens.slice(0, start).join(' ');
      const after = finding.tokens.slice(end).join(' ');
      return [before, `[${finding.tokens.slice(start, end).join(' ')}]`, after].filter((x) => x !== '').join(' ');
    }
    case 'identical':
      return finding.tokens.join(' ');
    case 'slot-outlier':
      return finding.value;
    case 'model-disagreement':
      return finding.tokens.join(' ');
  }
}

export interface PlaceContext {
  before: string;
  focus: string;
  after: string;
}

/** Up to `radius` words either side of the place; an ellipsis marks words left out. */
export function placeContext(utterance: ScanUtterance, location: FindingLocation, radius = 6): PlaceContext {
  const { words } = utterance;
  const from = Math.max(0, location.start - radius);
  const to = Math.min(words.length, location.end + radius);
  return {
    before: (from > 0 ? '… ' : '') + words.slice(from, location.start).join(' '),
    focus: words.slice(location.start, location.end).join(' '),
    after: words.slice(location.end, to).join(' ') + (to < words.length ? ' …' : ''),
  };
}

/** The label screen's query for a place: the utterance, and the gold layer when that is what was checked. */
export function labelQueryOf(location: FindingLocation): Record<string, string> {
  return location.layer === ANNOTATOR_GOLD ? { u: location.id, layer: ANNOTATOR_GOLD } : { u: location.id };
}
