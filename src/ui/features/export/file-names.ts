/** Names for downloaded files: project name made safe, the date, the part, and the format's extension. */
import type { ExportFormat, ExportPartName } from '../../../core/export';

const EXTENSION: Record<ExportFormat, string> = { iob2: 'iob2', bioes: 'bioes', jsonl: 'jsonl' };

/** Characters unsafe in file names on common systems (common practice, no source), as backups do. */
export function fileNameSafe(name: string): string {
  return name.replace(/[\p{Cc}<>:"/\\|?*]+/gu, '_').trim() || 'project';
}

/** e.g. `Boiler jobs-2025-03-14-train.iob2`; the date is the local calendar day of `now`. */
export function exportFileName(projectName: string, format: ExportFormat, part: ExportPartName, now: Date): string {
  const day = [now.getFullYear(), now.getMonth() + 1, now.getDate()].map((n, i) => String(n).padStart(i === 0 ? 4 : 2, '0')).join('-');
  const suffix = part === 'all' ? '' : `-${part}`;
  return `${fileNameSafe(projectName)}-${day}${suffix}.${EXTENSION[format]}`;
}
