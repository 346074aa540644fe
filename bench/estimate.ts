/**
 * Estimation benchmark: closed-model table (1,000 animals × 100 occasions), SECR fit (about 100
 * animals × 50 traps × 60 occasions, 4,000–5,000-point mask) beside a non-factorised baseline, and a
 * simulation study. Run: npx tsx bench/estimate.ts [--full]. All data are synthetic.
 */
import { estimateClosed } from '../server/estimation/closed';
import { fitHuggins } from '../server/estimation/huggins';
import { SeededRandom } from '../server/estimation/numeric/random';
import { naiveSecrLogLik } from '../server/estimation/secr/baseline';
import { prepareSecr, type SecrInput } from '../server/estimation/secr/data';
import { fitSecr } from '../server/estimation/secr/fit';
import { SecrLikelihood } from '../server/estimation/secr/likelihood';
import { buildMask } from '../server/estimation/secr/mask';
import { simulateSecr, trapGrid } from '../server/estimation/secr/simulate';
import { simulateClosed } from '../server/estimation/simulate-closed';
import { runSimulationStudy } from './estimate-simulation';
import { printTable, timeIt } from './estimate-timing';

const full = process.argv.includes('--full');

function closedBenchmark(): void {
  const rows = simulateClosed(
    { N: 1060, t: 100, p: 0.05, logitSd: 0.5 },
    new SeededRandom(101),
  ).slice(0, 1000);
  const histories = rows.map((r) => r.join(''));
  const table = timeIt(() => estimateClosed(histories), 5);
  // Baseline: the same M0/Mt/Mb estimates by generic animal-by-animal conditional-likelihood fits.
  const baseline = timeIt(
    () => ['M0', 'Mt', 'Mb'].map((form) => fitHuggins({ rows, form: form as 'M0' })),
    1,
  );
  const pieces = timeIt(() => estimateClosed(histories, { mixture: false, bootstrap: 0 }), 5);
  console.log(
    `\nClosed-model table: ${rows.length} animals × 100 occasions (synthetic), target ≤ 150 ms`,
  );
  printTable(
    ['what', 'wall ms', 'cpu ms'],
    [
      [
        'estimateClosed, full table (all models, Mth bootstrap B=200, mixture + profile CI)',
        table.wallMs,
        table.cpuMs,
      ],
      ['estimateClosed without mixture and bootstrap', pieces.wallMs, pieces.cpuMs],
      [
        'baseline: M0/Mt/Mb by generic Huggins optimiser (per animal)',
        baseline.wallMs,
        baseline.cpuMs,
      ],
    ],
  );
  console.log(`ratio baseline / full table (cpu): ${(baseline.cpuMs / table.cpuMs).toFixed(1)}×`);
}

function secrData(): SecrInput {
  const traps = trapGrid(10, 5, 500);
  return simulateSecr(
    {
      traps,
      occasions: 60,
      detector: 'proximity',
      density: 0.05,
      g0OrLambda0: 0.03,
      sigma: 400,
      buffer: 1600,
    },
    new SeededRandom(11),
  );
}

function secrBenchmark(): void {
  const input = secrData();
  const data = prepareSecr(input);
  const fitted = fitSecr(input);
  const mask = buildMask(input.traps, fitted.mask.spacing, fitted.mask.buffer);
  const lik = new SecrLikelihood(data, mask, input.traps);
  const beta = [
    Math.log(fitted.D ?? 0.05),
    Math.log((fitted.g0 ?? 0.03) / (1 - (fitted.g0 ?? 0.03))),
    Math.log(fitted.sigma ?? 400),
  ];
  const fast = timeIt(() => lik.evaluate(beta), 20);
  const fit = timeIt(() => fitSecr(input), 3);
  // Baseline: term-by-term likelihood (no factorisation), timed on 1 and 3 animals and scaled
  // linearly to all animals because a full evaluation takes minutes.
  const subset = (k: number): SecrInput => {
    const ids = new Set(data.animals.slice(0, k).map((a) => a.id));
    return { ...input, captures: input.captures.filter((c) => ids.has(c.animal)) };
  };
  const t1 = timeIt(() => naiveSecrLogLik(subset(1), mask, beta), 1);
  const t3 = timeIt(() => naiveSecrLogLik(subset(3), mask, beta), 1);
  const perAnimal = (t3.cpuMs - t1.cpuMs) / 2;
  const naive = t1.cpuMs - perAnimal + perAnimal * data.animals.length;
  console.log(
    `\nSECR: ${data.animals.length} animals, ${data.detections} detections, ${input.traps.length} traps × ${input.occasions} occasions, mask ${mask.points} points (synthetic), target ≤ 1 s`,
  );
  printTable(
    ['what', 'wall ms', 'cpu ms'],
    [
      ['factorised log-likelihood + gradient, one evaluation', fast.wallMs, fast.cpuMs],
      ['baseline: naive log-likelihood (value only), one evaluation, scaled', NaN, naive],
      ['fitSecr end to end (3 starts, SE, buffer refit at 1.5b)', fit.wallMs, fit.cpuMs],
    ],
  );
  console.log(`ratio naive / factorised per evaluation (cpu): ${(naive / fast.cpuMs).toFixed(0)}×`);
  console.log(
    `fitted D = ${fitted.densityPer100km2?.D.toFixed(1)} per 100 km², σ = ${fitted.sigma?.toFixed(0)} m, g0 = ${fitted.g0?.toFixed(4)} (truth 500, 400 m, 0.03)`,
  );
}

closedBenchmark();
secrBenchmark();
runSimulationStudy(full ? 1000 : 200, full ? 1000 : 50);
