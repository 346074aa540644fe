/** Figures, targets and the printed table of the Sort queue benchmark. */
import {
  freeCoreLatencies,
  printEndpoints,
  printStatements,
  TARGET_P95_MS,
  TARGET_RATIO,
} from './load-report';
import { describeLoad, round, type MachineLoad } from './report';
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

/** Prints the tables and returns the JSON record of the run. */
export function printSortReport(run: SortRun): object {
  console.log(
    `\nSort queue: ${run.size.photos} photos in ${run.size.events} events (synthetic), ` +
      `${run.size.stations} stations, ${run.size.reviewers} reviewers each with its own session, ` +
      `${run.size.sorted * 100}% already sorted (database built once in ${run.project.seconds.toFixed(0)} s, cached)`,
  );
  const verdicts = printEndpoints(run.figures, run.size.reviewers);
  console.log(
    `first batch per reviewer: ${run.firstBatch.distinct} distinct events, ${run.firstBatch.photos} ` +
      `thumbnail URLs; active leases after the run: ${run.leases?.leased ?? '?'} events held by ` +
      `${run.leases?.holders ?? '?'} reviewers`,
  );
  console.log(describeLoad(run.machine));
  console.log('\nIn one thread, no HTTP (median ms): service leaseNext / trivial meFor');
  for (const [order, d] of Object.entries(run.diagnosis.orders)) {
    console.log(`  order=${order}: leaseNext ${d.serviceMedianMs} ms`);
    printStatements(d.statements);
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
    meanLatencyOnFreeCoreMs: freeCoreLatencies(run.figures, run.size.reviewers),
    firstBatch: run.firstBatch,
    leasesAfterRun: run.leases,
    inProcess: run.diagnosis,
    machine: run.machine,
  };
}
