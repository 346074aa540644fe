/** Figures, targets and the printed tables of the Identify benchmark. */
import type { IdentifyProject, IdentifySize } from './identify-data';
import type { IdentifyDiagnosis } from './identify-diagnose';
import type { SearchFigures, Spread } from './identify-search';
import {
  freeCoreLatencies,
  printEndpoints,
  printStatements,
  TARGET_P95_MS,
  TARGET_RATIO,
} from './load-report';
import { describeLoad, printTable, round, type MachineLoad } from './report';
import type { ScenarioFigures } from './sort-load';

/** What the first call of every reviewer returned. */
export interface FirstCalls {
  distinctSightings: number;
  secondReviews: number;
  candidatesPerAnswer: number[];
  /** Sightings offered to a reviewer who had already called them (must be 0). */
  ownCallsOffered: number;
}

/** Everything one run measured. */
export interface IdentifyRun {
  size: IdentifySize;
  project: IdentifyProject;
  figures: ScenarioFigures[];
  firstCalls: FirstCalls;
  diagnosis: IdentifyDiagnosis;
  httpMachine: MachineLoad;
  search: SearchFigures;
  searchMachine: MachineLoad;
}

const TARGET_SEARCH_MEDIAN_MS = 10;

function printDiagnosis(d: IdentifyDiagnosis): void {
  console.log('\nIn one thread, no HTTP (median ms), one reviewer:');
  console.log(`  leaseNextSighting ${d.leaseMedianMs} ms`);
  printStatements(d.leaseStatements);
  console.log(`  sightingToIdentify ${d.sightingMedianMs} ms`);
  printStatements(d.sightingStatements);
  console.log(
    `  candidatesFor (pool cached, ${d.poolEntries} active individuals) ${d.candidatesMedianMs} ms; ` +
      `with typed text ${d.candidatesWithTextMedianMs} ms`,
  );
  printStatements(d.candidatesStatements);
  console.log(
    `  building the candidate pool (after a catalogue change): ${d.poolBuildMs.join(', ')} ms`,
  );
  console.log(`  meFor (the trivial endpoint's work) ${d.meMedianMs} ms`);
}

function printSearch(s: SearchFigures, machine: MachineLoad): boolean {
  console.log(
    `\nCatalogue search in one thread: CatalogueSearch (trigram shortlist, then fuse.js with ` +
      `CATALOGUE_SEARCH) beside fuse.js over every individual (baseline), ${s.individuals} synthetic ` +
      `individuals (code, nickname, ${s.meanTags} tags and ${s.meanNotesChars} characters of notes ` +
      `on average), through textScores as ranking calls it; ${s.timed} of ${s.queries} queries timed` +
      (s.budgetSeconds > 0 ? ` (budget ${s.budgetSeconds} s)` : '') +
      `, such as ${s.examples
        .slice(0, 4)
        .map((q) => `“${q}”`)
        .join(', ')}`,
  );
  const row = (what: string, x: Spread) => [what, x.count, x.medianMs, x.p95Ms, x.maxMs];
  printTable(
    ['queries', 'count', 'median ms', 'p95 ms', 'max ms'],
    [
      row(`all (${s.all.meanHits} hits on average)`, s.all),
      ...Object.entries(s.byKind).map(([kind, x]) => row(`  ${kind}`, x)),
      ['building the index', 3, s.indexBuildMs, '', Math.max(...s.indexBuilds)],
      row(`baseline: fuse.js over all (${s.baseline.meanHits} hits)`, s.baseline),
      ['baseline: building its index', 1, s.baselineIndexBuildMs, '', ''],
    ],
  );
  console.log(
    `median ${s.speedup}× faster than the baseline; same best score in ${(s.sameBest * 100).toFixed(1)} % ` +
      `of queries (within 0.01 of it in ${(s.nearBest * 100).toFixed(1)} %), ` +
      `${(s.topFiveOverlap * 100).toFixed(1)} % of the baseline's top-five scores found`,
  );
  const met = s.all.medianMs <= TARGET_SEARCH_MEDIAN_MS;
  console.log(`search median ≤ ${TARGET_SEARCH_MEDIAN_MS} ms per query ${met ? 'met' : 'MISSED'}`);
  console.log(`slowest: ${s.slowest.map((q) => `“${q.query}” ${q.ms} ms`).join('; ')}`);
  console.log(describeLoad(machine));
  return met;
}

/** Prints the tables and returns the JSON record of the run. */
export function printIdentifyReport(run: IdentifyRun): object {
  const { size, project } = run;
  console.log(
    `\nIdentify: ${size.photos} photos in ${size.events} events at ${size.stations} stations ` +
      `(synthetic); ${project.individuals} active individuals from ${project.confirmed} confirmed ` +
      `sightings (two agreeing calls each), ${project.proposed} proposed and ${project.open} open ` +
      `sightings; ${size.reviewers} reviewers each with its own session (database built once in ` +
      `${project.seconds.toFixed(0)} s, cached)`,
  );
  const verdicts = printEndpoints(run.figures, size.reviewers);
  const f = run.firstCalls;
  console.log(
    `first call per reviewer: ${f.distinctSightings} distinct sightings, ${f.secondReviews} of ` +
      `them second reviews; candidates per answer ${Math.min(...f.candidatesPerAnswer)}–` +
      `${Math.max(...f.candidatesPerAnswer)}; offered to a reviewer who had called it: ${f.ownCallsOffered}`,
  );
  console.log(describeLoad(run.httpMachine));
  printDiagnosis(run.diagnosis);
  const searchMet = printSearch(run.search, run.searchMachine);

  return {
    benchmark: 'identify',
    at: new Date().toISOString(),
    size,
    built: { ...project, reviewers: project.reviewers.length },
    buildSeconds: round(project.seconds, 1),
    endpoints: run.figures,
    verdicts,
    targets: {
      p95Ms: TARGET_P95_MS,
      ratioToTrivial: TARGET_RATIO,
      searchMedianMs: TARGET_SEARCH_MEDIAN_MS,
    },
    meanLatencyOnFreeCoreMs: freeCoreLatencies(run.figures, size.reviewers),
    firstCalls: run.firstCalls,
    inProcess: run.diagnosis,
    httpMachine: run.httpMachine,
    search: { ...run.search, medianMet: searchMet },
    searchMachine: run.searchMachine,
  };
}
