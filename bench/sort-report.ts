/** Figures, targets and the printed table of the Sort queue benchmark. */
import { describeLoad, printTable, round, type MachineLoad } from './report';
import type { SortProject, SortProjectSize } from './sort-data';
import type { QueueDiagnosis } from './sort-diagnose';
import type { ScenarioFigures } from './sort-load';

/** Everything one run measured. */
export interface SortRun {
  size: SortProjectSize;
  project: SortProject;
  figures: ScenarioFigures[];
  diagnosis: QueueDiagnosis;
  firstBatch: { events: number; photos: number; distinct: number };
  leases: { leased: number; holders: number } | null;
  machine: MachineLoad;
}

const TARGET_P95_MS = 50;
const TARGET_RATIO = 3;

function ok(figures: ScenarioFigures): boolean {
  return Object.keys(figures.statuses).every((s) => s === '200') && figures.errors === 0;
}

/** Prints the tables and returns the JSON record of the run. */
export function printSortReport(run: SortRun): object {
  const [trivial, ...queue] = run.figures;
  if (!trivial || queue.length === 0) throw new Error('no figures');
  const verdicts = queue.map((q) => {
    const ratio = q.p95Ms / trivial.p95Ms;
    return {
      name: q.name,
      ratio: round(ratio, 2),
      p95Met: q.p95Ms <= TARGET_P95_MS,
      ratioMet: ratio <= TARGET_RATIO,
      allAnswered: ok(q),
    };
  });

  console.log(
    `\nSort queue: ${run.size.photos} photos in ${run.size.events} events (synthetic), ` +
      `${run.size.stations} stations, ${run.size.reviewers} reviewers each with its own session, ` +
      `${run.size.sorted * 100}% already sorted (database built once in ${run.project.seconds.toFixed(0)} s, cached)`,
  );
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
    run.figures.map((f, i) => [
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
    `mean latency a free core would give ${run.size.reviewers} closed-loop clients ` +
      `(clients × server CPU per request): ` +
      run.figures
        .map(
          (f) =>
            `${f.name.split(':')[0]} ${(run.size.reviewers * f.serverCpuMsPerRequest).toFixed(1)} ms`,
        )
        .join(', '),
  );
  console.log(
    `first batch per reviewer: ${run.firstBatch.distinct} distinct events, ${run.firstBatch.photos} ` +
      `thumbnail URLs; active leases after the run: ${run.leases?.leased ?? '?'} events held by ` +
      `${run.leases?.holders ?? '?'} reviewers`,
  );
  console.log(describeLoad(run.machine));
  console.log('\nIn one thread, no HTTP (median ms): service leaseNext / trivial meFor');
  for (const [order, d] of Object.entries(run.diagnosis.orders)) {
    console.log(`  order=${order}: leaseNext ${d.serviceMedianMs} ms`);
    for (const s of d.statements) {
      console.log(`    ${s.medianMs} ms  ${s.sql.slice(0, 90)}…`);
      for (const step of s.plan) console.log(`        plan: ${step}`);
    }
  }
  console.log(`  meFor ${run.diagnosis.meMedianMs} ms`);
  console.log('  leaseNext with events at the head of the queue leased to someone else:');
  for (const f of run.diagnosis.foreignLeases) {
    console.log(`    ${f.leased} leased: oldest ${f.oldestMs} ms, by station ${f.stationMs} ms`);
  }

  return {
    benchmark: 'sort',
    at: new Date().toISOString(),
    size: run.size,
    buildSeconds: round(run.project.seconds, 1),
    endpoints: run.figures,
    verdicts,
    targets: { p95Ms: TARGET_P95_MS, ratioToTrivial: TARGET_RATIO },
    meanLatencyOnFreeCoreMs: Object.fromEntries(
      run.figures.map((f) => [f.name, round(run.size.reviewers * f.serverCpuMsPerRequest, 1)]),
    ),
    firstBatch: run.firstBatch,
    leasesAfterRun: run.leases,
    inProcess: run.diagnosis,
    machine: run.machine,
  };
}
