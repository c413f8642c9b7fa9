/**
 * Upgrades in real Chromium IndexedDB: each frozen fixture (tests/fixtures/db/v<N>-sample.json) is
 * written with the raw IndexedDB API at that schema version, exactly as Dexie laid it out (Dexie
 * stores version N as N × 10), then the app opens the database and must keep every row.
 */
import { expect, test, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { SCHEMA_VERSIONS, SCHEMA_VERSION_CURRENT } from '../src/db/schema';
import { watchOrigins } from './helpers';

const SLOW = 60_000;

type Tables = Record<string, Record<string, unknown>[]>;

function fixture(version: number): Tables {
  const file = JSON.parse(readFileSync(`tests/fixtures/db/v${version}-sample.json`, 'utf8')) as { schemaVersion: number; tables: Tables };
  expect(file.schemaVersion).toBe(version);
  return file.tables;
}

/** The Dexie store specs in force at `version` (later versions override a store's spec). */
function storesAt(version: number): Record<string, string> {
  const stores: Record<string, string> = {};
  for (const v of SCHEMA_VERSIONS) if (v.version <= version) Object.assign(stores, v.stores);
  return stores;
}

/** Create the database at `version` with the raw API and load the rows (typed arrays revived). */
async function databaseWrite(page: Page, version: number, tables: Tables): Promise<void> {
  await page.evaluate(
    ([idbVersion, stores, rows]) =>
      new Promise<void>((resolve, reject) => {
        const revive = (value: unknown): unknown => {
          if (Array.isArray(value)) return value.map(revive);
          if (typeof value === 'object' && value !== null) {
            const o = value as Record<string, unknown>;
            if (Array.isArray(o.$int32)) return Int32Array.from(o.$int32 as number[]);
            return Object.fromEntries(Object.entries(o).map(([k, v]) => [k, revive(v)]));
          }
          return value;
        };
        // Dexie's schema syntax: first entry the primary key ("++" auto-increment, "[a+b]" compound),
        // then indexes ("&" unique); an index is named by its spec without the prefix.
        const keyPath = (spec: string): string | string[] => (spec.startsWith('[') ? spec.slice(1, -1).split('+') : spec);
        const open = indexedDB.open('slotsmith', idbVersion);
        open.onupgradeneeded = () => {
          for (const [name, spec] of Object.entries(stores)) {
            const [primary = '', ...indexes] = spec.split(',').map((s) => s.trim());
            const auto = primary.startsWith('++');
            const store = open.result.createObjectStore(name, { keyPath: keyPath(primary.replace(/^\+\+/, '')), autoIncrement: auto });
            for (const index of indexes) {
              const unique = index.startsWith('&');
              const bare = index.replace(/^[&*]/, '');
              store.createIndex(bare, keyPath(bare), { unique });
            }
          }
        };
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const tx = db.transaction(Object.keys(stores), 'readwrite');
          for (const [name, list] of Object.entries(rows)) for (const row of list) tx.objectStore(name).add(revive(row));
          tx.oncomplete = () => {
            db.close();
            resolve();
          };
          tx.onerror = () => reject(tx.error);
        };
      }),
    [version * 10, storesAt(version), tables] as const,
  );
}

/** Every row of every store, typed arrays as {$int32}, plus the version and index names. */
function databaseRead(page: Page): Promise<{ version: number; indexes: Record<string, string[]>; tables: Tables }> {
  return page.evaluate(
    () =>
      new Promise<{ version: number; indexes: Record<string, string[]>; tables: Tables }>((resolve, reject) => {
        const encode = (value: unknown): unknown => {
          if (value instanceof Int32Array) return { $int32: Array.from(value) };
          if (Array.isArray(value)) return value.map(encode);
          if (typeof value === 'object' && value !== null) return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, encode(v)]));
          return value;
        };
        const open = indexedDB.open('slotsmith');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const names = [...db.objectStoreNames];
          const tx = db.transaction(names);
          const tables: Tables = {};
          const indexes: Record<string, string[]> = {};
          for (const name of names) {
            const store = tx.objectStore(name);
            indexes[name] = [...store.indexNames].sort();
            const req = store.getAll();
            req.onsuccess = () => {
              tables[name] = (req.result as unknown[]).map(encode) as Record<string, unknown>[];
            };
          }
          tx.oncomplete = () => {
            db.close();
            resolve({ version: db.version, indexes, tables });
          };
        };
      }),
  );
}

for (const version of SCHEMA_VERSIONS.map((v) => v.version)) {
  test(`a version ${version} database opens in the app with every project, layer and history row intact`, async ({ page, baseURL }) => {
    test.setTimeout(120_000);
    const foreign = watchOrigins(page, baseURL ?? '');
    const tables = fixture(version);
    // A same-origin page that does not start the app, so the old database is made before the app opens it.
    await page.goto('/favicon.svg');
    await databaseWrite(page, version, tables);

    await page.goto('/');
    const projects = page.getByRole('list', { name: 'Projects' });
    const name = String(tables.projects?.[0]?.name);
    await expect(projects).toContainText(name, { timeout: SLOW });
    await expect(projects).toContainText(`${tables.utterances?.length ?? 0} utterances`);

    const after = await databaseRead(page);
    expect(after.version).toBe(SCHEMA_VERSION_CURRENT * 10);
    // The current schema's indexes exist on the old rows' stores.
    expect(after.indexes.utterances).toContain('[projectId+externalId]');
    for (const [store, rows] of Object.entries(tables)) expect(after.tables[store], store).toEqual(rows);

    // Through the screens: the table lists every utterance, and a layer shows on the label screen.
    const projectId = Number(tables.projects?.[0]?.id);
    await page.goto(`/#/p/${projectId}/corpus`);
    const rows = page.getByRole('main').getByRole('row');
    for (const u of tables.utterances ?? []) {
      const label = typeof u.externalId === 'string' ? u.externalId : `#${String(u.seq)}`;
      const row = rows.filter({ has: page.getByRole('cell', { name: label, exact: true }) });
      await expect(row, label).toHaveCount(1, { timeout: SLOW });
      // The row shows the text with slot names beside labelled tokens: every word is there, in order.
      const shown = (await row.textContent()) ?? '';
      let from = 0;
      for (const word of String(u.text).split(/\s+/)) {
        const at = shown.indexOf(word, from);
        expect(at, `${label}: "${word}" in "${shown}"`).toBeGreaterThanOrEqual(0);
        from = at + word.length;
      }
    }
    expect(foreign).toEqual([]);
  });
}
