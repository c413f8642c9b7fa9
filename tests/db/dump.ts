/**
 * Whole-database dumps as plain JSON (typed arrays as {"$int32": [...]}): to compare a database
 * before and after a failed write, and to load the frozen fixtures of the upgrade test.
 */
import type Dexie from 'dexie';

export type Dump = Record<string, unknown[]>;

function encode(value: unknown): unknown {
  if (value instanceof Int32Array) return { $int32: Array.from(value) };
  if (Array.isArray(value)) return value.map(encode);
  if (typeof value === 'object' && value !== null) return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, encode(v)]));
  return value;
}

export function dumpRevive(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(dumpRevive);
  if (typeof value === 'object' && value !== null) {
    const object = value as Record<string, unknown>;
    if (Array.isArray(object.$int32)) return Int32Array.from(object.$int32 as number[]);
    return Object.fromEntries(Object.entries(object).map(([k, v]) => [k, dumpRevive(v)]));
  }
  return value;
}

export async function dbDump(db: Dexie): Promise<Dump> {
  const dump: Dump = {};
  for (const table of db.tables) dump[table.name] = (await table.toArray()).map(encode);
  return dump;
}

/** Rows go in with their stored keys, so auto-increment keys are kept. */
export async function dbLoad(db: Dexie, dump: Dump): Promise<void> {
  await db.transaction('rw', db.tables, async () => {
    for (const table of db.tables) await table.bulkAdd((dump[table.name] ?? []).map(dumpRevive));
  });
}
