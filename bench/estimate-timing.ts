/** Timing helpers for the estimation benchmark: wall-clock and CPU time, median of repeats. */

/** One timed measurement in milliseconds. */
export interface Timing {
  wallMs: number;
  cpuMs: number;
}

/** Run `fn` once to warm up, then `repeats` times; report the median wall and CPU time. */
export function timeIt(fn: () => unknown, repeats = 5): Timing {
  fn();
  const walls: number[] = [];
  const cpus: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    walls.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1000);
  }
  return { wallMs: median(walls), cpuMs: median(cpus) };
}

/** Median of a list of numbers. */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/** Fixed-width table printing. */
export function printTable(header: string[], rows: (string | number)[][]): void {
  const cells = [header, ...rows.map((r) => r.map((c) => (typeof c === 'number' ? format(c) : c)))];
  const widths = header.map((_, i) => Math.max(...cells.map((r) => String(r[i]).length)));
  for (const [n, r] of cells.entries()) {
    console.log(r.map((c, i) => String(c).padStart(widths[i])).join('  '));
    if (n === 0) console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  }
}

function format(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (Math.abs(v) >= 100) return v.toFixed(0);
  if (Math.abs(v) >= 1) return v.toFixed(2);
  return v.toFixed(3);
}
