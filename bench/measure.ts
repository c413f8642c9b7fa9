import { spawnSync } from 'node:child_process';

export interface Measurement {
  label: string;
  medianSeconds: number;
  runsSeconds: number[];
  peakRssMb: number | null;
  exitCode: number | null;
}

/** One whole-process run under GNU time, for wall time and peak resident memory. */
function runOnce(command: string[]): { seconds: number; rssMb: number | null; code: number | null; stdout: string } {
  const useTime = process.platform === 'linux';
  const argv = useTime ? ['/usr/bin/time', '-f', '__RSS_KB__=%M', ...command] : command;
  const started = process.hrtime.bigint();
  const result = spawnSync(argv[0] as string, argv.slice(1), { encoding: 'utf8', maxBuffer: 1 << 30 });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  const match = /__RSS_KB__=(\d+)/.exec(result.stderr ?? '');
  return { seconds, rssMb: match ? Number(match[1]) / 1024 : null, code: result.status, stdout: result.stdout };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

/** Run the commands interleaved (A B A B …) so machine noise hits both sides alike. */
export function measureInterleaved(commands: Record<string, string[]>, repeats: number): Record<string, Measurement> {
  const runs: Record<string, ReturnType<typeof runOnce>[]> = {};
  for (const label of Object.keys(commands)) runs[label] = [];
  for (let r = 0; r < repeats; r++) {
    for (const [label, command] of Object.entries(commands)) runs[label]?.push(runOnce(command));
  }
  const out: Record<string, Measurement> = {};
  for (const [label, list] of Object.entries(runs)) {
    const rss = list.map((x) => x.rssMb).filter((x): x is number => x !== null);
    out[label] = {
      label,
      medianSeconds: median(list.map((x) => x.seconds)),
      runsSeconds: list.map((x) => x.seconds),
      peakRssMb: rss.length > 0 ? Math.max(...rss) : null,
      exitCode: list[0]?.code ?? null,
    };
  }
  return out;
}

export function runCapture(command: string[]): { code: number | null; stdout: string } {
  const { code, stdout } = runOnce(command);
  return { code, stdout };
}
