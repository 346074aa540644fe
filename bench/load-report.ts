/**
 * The endpoint table and verdicts shared by the HTTP load benchmarks (Sort queue, Identify): each
 * endpoint's latencies beside the trivial signed-in endpoint measured in the same run.
 */
import { printTable, round } from './report';
import type { StatementProfile } from './sort-diagnose';
import type { ScenarioFigures } from './sort-load';

/** Targets of the load benchmarks: p95 under 20 clients, and p95 relative to the trivial endpoint. */
export const TARGET_P95_MS = 50;
export const TARGET_RATIO = 3;

/** Whether one endpoint met the targets. */
export interface EndpointVerdict {
  name: string;
  ratio: number;
  p95Met: boolean;
  ratioMet: boolean;
  allAnswered: boolean;
}

function ok(figures: ScenarioFigures, statuses: string[]): boolean {
  return Object.keys(figures.statuses).every((s) => statuses.includes(s)) && figures.errors === 0;
}

/**
 * Prints the endpoint table (the first scenario is the trivial one), a verdict line per other
 * endpoint and the latency a free core would give; `okStatuses` are the answers that count as
 * served. Returns the verdicts.
 */
export function printEndpoints(
  figures: ScenarioFigures[],
  clients: number,
  okStatuses = ['200'],
): EndpointVerdict[] {
  const [trivial, ...others] = figures;
  if (!trivial || others.length === 0) throw new Error('no figures');
  printTable(
    [
      'endpoint',
      'requests',
      'req/s',
      'p50 ms',
      'p95 ms',
      'p99 ms',
      'max ms',
      'non-200',
      'errors',
      'p95 / trivial',
      'server CPU ms/req',
    ],
    figures.map((f, i) => [
      f.name,
      f.requests,
      f.requestsPerSecond,
      f.p50Ms,
      f.p95Ms,
      f.p99Ms,
      f.maxMs,
      String(f.requests - (f.statuses['200'] ?? 0)),
      `${f.errors} (${f.timeouts} timeouts)`,
      i === 0 ? '1×' : `${(f.p95Ms / trivial.p95Ms).toFixed(2)}×`,
      f.serverCpuMsPerRequest,
    ]),
  );
  const verdicts = others.map((q) => {
    const ratio = q.p95Ms / trivial.p95Ms;
    return {
      name: q.name,
      ratio: round(ratio, 2),
      p95Met: q.p95Ms <= TARGET_P95_MS,
      ratioMet: ratio <= TARGET_RATIO,
      allAnswered: ok(q, okStatuses),
    };
  });
  for (const v of verdicts) {
    console.log(
      `${v.name}: p95 ≤ ${TARGET_P95_MS} ms ${v.p95Met ? 'met' : 'MISSED'}; ` +
        `≤ ${TARGET_RATIO}× trivial ${v.ratioMet ? 'met' : 'MISSED'}` +
        (v.allAnswered ? '' : '; some requests failed'),
    );
  }
  // A single-threaded server shared by N closed-loop clients answers each after about N requests'
  // worth of CPU, so clients × CPU per request is what the mean latency tends to on a free core.
  console.log(
    `mean latency a free core would give ${clients} closed-loop clients ` +
      `(clients × server CPU per request): ` +
      figures
        .map((f) => `${f.name.split(':')[0]} ${(clients * f.serverCpuMsPerRequest).toFixed(1)} ms`)
        .join(', '),
  );
  return verdicts;
}

/** The same latency per endpoint for the JSON record. */
export function freeCoreLatencies(figures: ScenarioFigures[], clients: number) {
  return Object.fromEntries(
    figures.map((f) => [f.name, round(clients * f.serverCpuMsPerRequest, 1)]),
  );
}

/** SQL statements with their median time and query plan, indented under a heading. */
export function printStatements(statements: StatementProfile[]): void {
  for (const s of statements) {
    console.log(`    ${s.medianMs} ms  ${s.sql.slice(0, 90)}…`);
    for (const step of s.plan) console.log(`        plan: ${step}`);
  }
}
