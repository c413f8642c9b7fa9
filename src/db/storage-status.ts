/**
 * Storage persistence and usage (Storage Standard: `navigator.storage.persist()`, `persisted()`,
 * `estimate()`). Without persistence the browser may evict the data under storage pressure.
 */

/** The part of `navigator.storage` used here; injected in tests. */
export interface StorageManagerLike {
  persist?: () => Promise<boolean>;
  persisted?: () => Promise<boolean>;
  estimate?: () => Promise<{ usage?: number; quota?: number }>;
}

export interface StorageStatus {
  /** null when the browser cannot tell. */
  persisted: boolean | null;
  usage: number | null;
  quota: number | null;
}

function storageDefault(): StorageManagerLike | undefined {
  return typeof navigator === 'undefined' ? undefined : navigator.storage;
}

/**
 * Usage, quota and whether the data is persistent. With `requestPersist`, first asks for persistence
 * (browsers may grant it silently or ask the user); a refusal is reported, never thrown.
 */
export async function storageStatus(options: { storage?: StorageManagerLike | null; requestPersist?: boolean } = {}): Promise<StorageStatus> {
  // null: a browser without the Storage API (tests use it); absent: this browser's own.
  const storage = options.storage === undefined ? storageDefault() : options.storage;
  const status: StorageStatus = { persisted: null, usage: null, quota: null };
  if (storage === null || storage === undefined) return status;
  try {
    if (options.requestPersist === true && storage.persist !== undefined) status.persisted = await storage.persist();
    if (status.persisted !== true && storage.persisted !== undefined) status.persisted = await storage.persisted();
  } catch {
    // Some browsers reject in private windows or insecure contexts; "unknown" is the honest answer.
  }
  try {
    const estimate = await storage.estimate?.();
    if (typeof estimate?.usage === 'number') status.usage = estimate.usage;
    if (typeof estimate?.quota === 'number') status.quota = estimate.quota;
  } catch {
    // As above: unknown usage is shown as unknown.
  }
  return status;
}
