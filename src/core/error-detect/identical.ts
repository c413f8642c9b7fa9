import { locationCompare, stringCompare, tagsNormalise, tokenFold } from './normalise';
import type { FindingLocation, IdenticalFinding, LabelledUtterance } from './types';

type IdenticalReading = IdenticalFinding['readings'][number];

/**
 * Utterances with the same case-folded token sequence but different tags or intents. Ranked by
 * how clear the majority is (a lone dissenter among many agreeing copies is the likeliest slip;
 * common practice, no source), then by the number of copies.
 */
export function identicalFind(utterances: readonly LabelledUtterance[]): IdenticalFinding[] {
  const groups = new Map<string, { tokens: string[]; readings: Map<string, IdenticalReading> }>();
  for (const utterance of utterances) {
    const tokens = utterance.tokens.map(tokenFold);
    const textKey = tokens.join('\u0000');
    let group = groups.get(textKey);
    if (group === undefined) {
      group = { tokens, readings: new Map() };
      groups.set(textKey, group);
    }
    const tags = tagsNormalise(utterance);
    const intent = utterance.intent ?? null;
    const readingKey = `${tags.join(' ')}\u0000${intent ?? '\u0001'}`;
    const location: FindingLocation = { id: utterance.id, layer: utterance.layer, start: 0, end: tokens.length };
    const reading = group.readings.get(readingKey);
    if (reading === undefined) group.readings.set(readingKey, { tags, intent, locations: [location] });
    else reading.locations.push(location);
  }
  const findings: IdenticalFinding[] = [];
  for (const { tokens, readings } of groups.values()) {
    if (readings.size < 2) continue;
    const list = [...readings.values()];
    for (const reading of list) reading.locations.sort(locationCompare);
    list.sort(
      (a, b) =>
        b.locations.length - a.locations.length ||
        stringCompare(a.tags.join(' '), b.tags.join(' ')) ||
        stringCompare(a.intent ?? '', b.intent ?? ''),
    );
    const occurrences = list.reduce((sum, reading) => sum + reading.locations.length, 0);
    const firstTags = list[0]?.tags.join(' ');
    const firstIntent = list[0]?.intent;
    findings.push({
      kind: 'identical',
      tokens,
      tagsDiffer: list.some((reading) => reading.tags.join(' ') !== firstTags),
      intentsDiffer: list.some((reading) => reading.intent !== firstIntent),
      readings: list,
      occurrences,
      majorityShare: (list[0]?.locations.length ?? 0) / occurrences,
    });
  }
  return findings.sort(
    (a, b) =>
      b.majorityShare - a.majorityShare ||
      b.occurrences - a.occurrences ||
      stringCompare(a.tokens.join(' '), b.tokens.join(' ')),
  );
}
