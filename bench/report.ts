/**
 * Reporting helpers shared by the ingest and sort benchmarks: a plain-text table, the JSON result
 * file under bench/.out/, and what else the machine was doing while the figures were taken.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Where benchmarks keep caches and their latest figures (ignored by git). */
export const OUT_DIR = join(dirname(fileURLToPath(import.meta.url)), '.out');

/** The repository root (the server is started from here). */
export const REPO_ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');

/** Prints rows as a fixed-width table with a header rule. */
export function printTable(header: string[], rows: (string | number)[][]): void {
  const cells = [header, ...rows.map((r) => r.map((c) => (typeof c === 'number' ? fmt(c) : c)))];
  const widths = header.map((_, i) => Math.max(...cells.map((r) => String(r[i] ?? '').length)));
  for (const [n, row] of cells.entries()) {
    console.log(row.map((c, i) => String(c).padEnd(widths[i]!)).join('  '));
    if (n === 0) console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  }
}

/** A number with sensible precision for a table. */
export function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (Math.abs(v) >= 100) return v.toFixed(0);
  if (Math.abs(v) >= 10) return v.toFixed(1);
  if (Math.abs(v) >= 1) return v.toFixed(2);
  return v.toFixed(3);
}

/** Rounds for JSON output. */
export function round(v: number, digits = 3): number {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

/** Writes the latest figures to bench/.out/<name>.json and prints them as one JSON line. */
export function writeResult(name: string, result: object): string {
  mkdirSync(OUT_DIR, { recursive: true });
  const path = join(OUT_DIR, `${name}.json`);
  writeFileSync(path, `${JSON.stringify(result, null, 2)}\n`);
  console.log(JSON.stringify(result));
  return path;
}

/** Exact percentile (nearest rank) of unsorted values. */
export function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = Float64Array.from(values).sort();
  const rank = Math.min(sorted.length, Math.max(1, Math.ceil((p / 100) * sorted.length)));
  return sorted[rank - 1]!;
}

// Linux reports CPU time in USER_HZ ticks, 100 per second on every common configuration.
const TICKS_PER_SECOND = 100;

function readTicks(path: string, pick: (fields: string[]) => number): number {
  try {
    return pick(readFileSync(path, 'utf8').trim().split(/\s+/));
  } catch {
    return 0;
  }
}

// /proc/stat "cpu" line: user nice system idle iowait irq softirq steal ...; busy = all but idle+iowait.
function machineBusyTicks(): number {
  return readTicks('/proc/stat', (f) =>
    f.slice(1, 9).reduce((s, v, i) => (i === 3 || i === 4 ? s : s + Number(v)), 0),
  );
}

// /proc/<pid>/stat fields 14 and 15 (utime, stime); the command name has no spaces for node.
function processTicks(pid: number): number {
  return readTicks(`/proc/${pid}/stat`, (f) => Number(f[13]) + Number(f[14]));
}

/** CPU time a process has used so far (all its threads), in seconds; 0 once it has exited. */
export function processCpuSeconds(pid: number): number {
  return processTicks(pid) / TICKS_PER_SECOND;
}

/** What the rest of the machine did during a measurement, so figures can be judged. */
export interface MachineLoad {
  cores: number;
  loadAverage1mAtStart: number;
  loadAverage1mAtEnd: number;
  /** CPU time spent by processes other than the benchmark and its server, in core-seconds. */
  otherCpuSeconds: number;
  /** The same as an average number of busy cores over the measurement. */
  otherBusyCores: number;
  /** CPU time of the benchmark's own processes (itself and the server it started). */
  ownCpuSeconds: number;
  seconds: number;
}

/**
 * Measures the CPU time other processes use while the benchmark runs: machine busy time from
 * /proc/stat minus the time of our own processes. Call `track` for every process we start and
 * `finish` before any of them exits.
 */
export class LoadMeter {
  private readonly startedAt = performance.now();
  private readonly busy0 = machineBusyTicks();
  private readonly load0 = loadavg()[0]!;
  private readonly own = new Map<number, number>([[process.pid, processTicks(process.pid)]]);

  /** Counts a process we started (its CPU time is ours, not the machine's other load). */
  track(pid: number): void {
    if (!this.own.has(pid)) this.own.set(pid, processTicks(pid));
  }

  /** The load figures from the start until now. */
  finish(): MachineLoad {
    const seconds = (performance.now() - this.startedAt) / 1000;
    let ownTicks = 0;
    for (const [pid, start] of this.own) ownTicks += Math.max(0, processTicks(pid) - start);
    const other = Math.max(0, machineBusyTicks() - this.busy0 - ownTicks) / TICKS_PER_SECOND;
    return {
      cores: cpus().length,
      loadAverage1mAtStart: round(this.load0, 2),
      loadAverage1mAtEnd: round(loadavg()[0]!, 2),
      otherCpuSeconds: round(other, 1),
      otherBusyCores: round(other / Math.max(seconds, 1e-9), 2),
      ownCpuSeconds: round(ownTicks / TICKS_PER_SECOND, 1),
      seconds: round(seconds, 1),
    };
  }
}

/** One line describing the machine load, for the printed report. */
export function describeLoad(load: MachineLoad): string {
  return (
    `machine: ${load.cores} cores; load average ${load.loadAverage1mAtStart} → ` +
    `${load.loadAverage1mAtEnd}; other processes used ${load.otherCpuSeconds} core-s ` +
    `(${load.otherBusyCores} cores on average) over ${load.seconds} s; ours ${load.ownCpuSeconds} core-s`
  );
}
