/**
 * Coat-pattern engine benchmark (all photos synthetic, painted by seeds/photos): extraction time,
 * accuracy per condition on held-out individuals, score distributions for true and false pairs,
 * query time against catalogues of 500 and 5,000 individuals (2 flanks × 3 references each) beside
 * a brute-force baseline, and a 500-iteration memory check.
 * Run: npx tsx bench/pattern.ts [--quick] [--set train] [--flank] [--no-baseline]
 * The first run paints ~1,100 photos (~7 min on one core); later runs read bench/.out.
 */
import { PATTERN_PARAMS } from '../server/pattern/types';
import { createPatternPool, type PatternPool } from '../server/pattern/pool';
import { accuracyTable, quantile, summarise, type QueryOutcome } from '../tests/pattern/evaluation';
import { printTable, median } from './estimate-timing';
import { bruteForce, extractionTimes, memoryCheck, runQueries } from './pattern-measure';
import { buildCatalogue, loadSets, setNames, type LoadedSets } from './pattern-sets';

const quick = process.argv.includes('--quick');
/** Pass each query's recorded flank, as Identify does (default: flank unknown, both ways). */
const flankAware = process.argv.includes('--flank');
const setKind = process.argv[process.argv.indexOf('--set') + 1] === 'train' ? 'train' : 'eval';
const sizes = quick
  ? { catalogue: 15, unknown: 4, distractors: 30 }
  : { catalogue: 40, unknown: 10, distractors: 100 };
const pct = (v: number) => `${(v * 100).toFixed(1)} %`;

function printAccuracy(title: string, outcomes: readonly QueryOutcome[]): void {
  console.log(`\n${title}`);
  printTable(
    ['condition', 'queries', 'top-1', 'top-5'],
    accuracyTable(outcomes).map((r) => [r.condition, r.queries, pct(r.top1), pct(r.top5)]),
  );
}

function printScores(outcomes: readonly QueryOutcome[], unknown: readonly QueryOutcome[]): void {
  const t = PATTERN_PARAMS.matchThreshold;
  const rows: [string, number[]][] = [
    ['true individual', outcomes.map((o) => o.trueScore)],
    [
      'best wrong individual (catalogued query)',
      outcomes.map((o) => Math.max(0, ...o.falseScores)),
    ],
    ['every wrong individual ranked', outcomes.flatMap((o) => o.falseScores)],
    ['best score, individual not catalogued', unknown.map((o) => Math.max(0, ...o.falseScores))],
  ];
  console.log(
    `\nScores (inliers / (inliers + ${PATTERN_PARAMS.scoreHalfInliers})), threshold ${t}`,
  );
  printTable(
    ['pairs', 'n', 'min', 'p05', 'median', 'p95', 'max', `≥ ${t}`],
    rows.map(([name, v]) => {
      const s = summarise(v);
      return [
        name,
        s.n,
        s.min,
        s.p05,
        s.median,
        s.p95,
        s.max,
        pct(v.filter((x) => x >= t).length / v.length),
      ];
    }),
  );
}

async function accuracySection(pool: PatternPool, sets: LoadedSets) {
  const real = [...sets.references, ...sets.distractors];
  const built = buildCatalogue(real, sets.distractors, 0);
  const run = await runQueries(pool, built.source, sets.queries, sets.unknown, flankAware);
  const individuals = new Set(real.map((r) => r.individualId)).size;
  printAccuracy(
    `Accuracy, ${sets.queries.length} held-out queries against ${individuals} painted individuals ` +
      `(${sets.references.length / 6} with queries + ${sets.distractors.length / 6} distractors), ` +
      `${real.length} references`,
    run.outcomes,
  );
  printScores(run.outcomes, run.unknown);
  return run;
}

async function scaleSection(pool: PatternPool, sets: LoadedSets, extractMs: number) {
  const rows: (string | number)[][] = [];
  const medians: Record<number, number> = {};
  for (const n of quick ? [500] : [500, 5000]) {
    const built = buildCatalogue([...sets.references, ...sets.distractors], sets.distractors, n);
    const run = await runQueries(pool, built.source, sets.queries, [], flankAware);
    const acc = accuracyTable(run.outcomes).at(-1);
    medians[n] = median(run.rankMs);
    rows.push([
      n,
      built.references,
      built.mosaics,
      (built.buildMs / 1000).toFixed(1),
      median(run.shortlistMs),
      median(run.rankMs),
      quantile(run.rankMs, 0.95),
      median(run.rankCpuMs),
      median(run.rankMs) + extractMs,
      pct(acc?.top1 ?? NaN),
      pct(acc?.top5 ?? NaN),
    ]);
    printAccuracy(`Accuracy at ${n} individuals`, run.outcomes);
  }
  console.log(
    '\nQuery time by catalogue size (one worker thread; mosaic stand-ins fill the catalogue)',
  );
  printTable(
    [
      'individuals',
      'references',
      'of them mosaics',
      'index build s',
      'shortlist ms',
      'rank ms median',
      'rank ms p95',
      'rank cpu ms',
      '+ query extraction',
      'top-1',
      'top-5',
    ],
    rows,
  );
  return medians;
}

async function baselineSection(sets: LoadedSets, medians: Record<number, number>) {
  const sample = sets.queries.filter((_, i) => i % (quick ? 8 : 10) === 0);
  const base = await bruteForce(sets.references, sample);
  const top = accuracyTable(base.outcomes).at(-1);
  console.log(
    `\nBaseline: OpenCV verification of every reference, as seen and flipped, no shortlist ` +
      `(${sample.length} queries × ${sets.references.length * 2} pairs against the ` +
      `${sets.references.length / 6} query individuals only)`,
  );
  console.log(
    `  ${base.msPerPair.toFixed(1)} ms per pair; top-1 ${pct(top?.top1 ?? NaN)}, top-5 ${pct(top?.top5 ?? NaN)}`,
  );
  printTable(
    ['individuals', 'baseline s per query (extrapolated)', 'engine s per query', 'ratio'],
    Object.entries(medians).map(([n, ms]) => {
      const baseMs = base.msPerPair * Number(n) * 6 * 2;
      return [n, baseMs / 1000, ms / 1000, `${(baseMs / ms).toFixed(0)}×`];
    }),
  );
}

async function main(): Promise<void> {
  console.log(
    `Pattern benchmark (${setKind} set${quick ? ', quick' : ''}, ` +
      `${flankAware ? 'recorded flank passed as Identify does' : 'flank unknown'}); synthetic photos only`,
  );
  const pool = createPatternPool(1);
  try {
    const sets = await loadSets(pool, setNames(setKind, sizes));
    const ex = await extractionTimes(
      pool,
      sets.queries.slice(0, quick ? 8 : 24).map((q) => q.plan),
    );
    console.log(`\nFeature extraction from JPEG (1024×768, decode included), ${ex.photos} photos:`);
    printTable(
      ['views', 'ms per photo (median)', 'bytes serialised'],
      [
        ['as seen (references)', ex.plainMs, ex.bytesPlain],
        ['as seen + flipped (queries)', ex.bothMs, ex.bytesBoth],
      ],
    );
    await accuracySection(pool, sets);
    const medians = await scaleSection(pool, sets, ex.bothMs);
    if (process.argv.includes('--no-baseline')) return;
    await baselineSection(sets, medians);
    const iterations = quick ? 100 : 500;
    const mem = await memoryCheck(pool, sets.queries[0].plan, sets.references, iterations);
    const mb = (b: number) => (b / 2 ** 20).toFixed(2);
    console.log(
      `\nWorker heap top: ${mb(mem.start)} MB after warm-up, ${mb(mem.afterExtract)} MB after ` +
        `${iterations} extractions, ${mb(mem.afterRank)} MB after ${iterations} rankings`,
    );
  } finally {
    await pool.close();
  }
}

await main();
