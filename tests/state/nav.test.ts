import { describe, expect, it } from 'vitest';
import { navFromHash, navToHash, queryParse, queryText } from '../../src/state/nav';

describe('navFromHash / navToHash', () => {
  it('reads every project screen and its query', () => {
    expect(navFromHash('#/p/3/corpus?status=done&slot=area')).toEqual({ view: 'corpus', projectId: 3, query: { slot: 'area', status: 'done' } });
    expect(navFromHash('#/p/12/label?u=40')).toEqual({ view: 'label', projectId: 12, query: { u: '40' } });
    expect(navFromHash('#/p/1/schema')).toEqual({ view: 'schema', projectId: 1, query: {} });
  });

  it('falls back to the project list on anything else', () => {
    for (const hash of ['', '#/', '#/p/x/corpus', '#/p/3/nowhere', '#/projects']) {
      expect(navFromHash(hash)).toEqual({ view: 'projects', projectId: null, query: {} });
    }
  });

  it('writes one URL per state: keys sorted, empty values dropped', () => {
    expect(navToHash('corpus', 3, { status: 'done', q: 'boiler leak', slot: '' })).toBe('#/p/3/corpus?q=boiler+leak&status=done');
    expect(navToHash('projects', 3)).toBe('#/projects');
    expect(navToHash('import', null)).toBe('#/projects');
  });

  it('round-trips text with reserved characters', () => {
    const query = { q: 'a&b=c #5 ü', slot: 'area.from' };
    expect(navFromHash(navToHash('corpus', 7, query)).query).toEqual(query);
    expect(queryParse(queryText(query))).toEqual(query);
  });
});
