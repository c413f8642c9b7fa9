/** Plain words for storage figures and restore outcomes on the settings screen. */
import type { ReadError } from '../../../core/types';
import type { StorageStatus } from '../../../db';

/** Binary units, one decimal (common practice, no source). */
export function bytesText(bytes: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return unit === 0 ? `${bytes} bytes` : `${value.toFixed(1)} ${units[unit]}`;
}

export function storageUsageText(status: StorageStatus): string {
  if (status.usage === null || status.quota === null) return 'This browser does not say how much space is used.';
  const share = status.quota > 0 ? ` (${((status.usage / status.quota) * 100).toFixed(1)} %)` : '';
  return `${bytesText(status.usage)} used of ${bytesText(status.quota)} this browser allows${share}.`;
}

export function storagePersistText(persisted: boolean | null): string {
  if (persisted === true) return 'Kept: the browser will not clear this data to free space.';
  if (persisted === false) return 'Not kept yet: when the disk runs low, the browser may clear this data. Save backups regularly.';
  return 'This browser does not say whether it keeps this data when space runs low. Save backups regularly.';
}

// The rule lives with the restore itself (it runs in the restore worker's transaction).
export { restoreNameFree } from '../../../db/backup-repo';

export function readErrorText(e: ReadError): string {
  return `Line ${e.line}: ${e.message}`;
}

/**
 * The project name inside a backup, read from its second line (the project record) without decoding
 * the whole file; undefined when that line is not a project record (the full decode then says why).
 */
export function backupProjectName(text: string): string | undefined {
  const first = text.indexOf('\n');
  if (first < 0) return undefined;
  const second = text.indexOf('\n', first + 1);
  try {
    const record: unknown = JSON.parse(text.slice(first + 1, second < 0 ? undefined : second));
    if (typeof record !== 'object' || record === null) return undefined;
    const { type, name } = record as { type?: unknown; name?: unknown };
    return type === 'project' && typeof name === 'string' ? name : undefined;
  } catch {
    return undefined;
  }
}
