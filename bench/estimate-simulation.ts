/** Simulation study for the estimation benchmark (§7 scenarios): bias, RSE, CV and coverage. */
import { chaoMh } from '../server/estimation/chao';
import { jackknifeMh } from '../server/estimation/jackknife';
import { SeededRandom } from '../server/estimation/numeric/random';
import { modelM0, modelMb, modelMt } from '../server/estimation/otis-models';
import { fitSecr } from '../server/estimation/secr/fit';
import { simulateSecr, trapGrid } from '../server/estimation/secr/simulate';
import {
  addMissedMatches,
  simulateClosed,
  type ClosedScenario,
} from '../server/estimation/simulate-closed';
import { summarise } from '../server/estimation/summary';
import type { Interval } from '../shared/estimate';
import { printTable } from './estimate-timing';

interface Outcome {
  N: number | null;
  se: number | null;
  ci: Interval | null;
}

/** Accumulates one estimator's replicates against the truth. */
class Tally {
  private values: number[] = [];
  private rses: number[] = [];
  private covered = 0;
  failed = 0;

  add(o: Outcome, truth: number): void {
    if (o.N === null || o.ci === null) {
      this.failed++;
      return;
    }
    this.values.push(o.N);
    if (o.se !== null) this.rses.push(o.se / o.N);
    if (o.ci[0] <= truth && (o.ci[1] ?? Infinity) >= truth) this.covered++;
  }

  row(scenario: string, name: string, truth: number, R: number): (string | number)[] {
    const n = this.values.length;
    const mean = this.values.reduce((a, v) => a + v, 0) / n;
    const sd = Math.sqrt(this.values.reduce((a, v) => a + (v - mean) ** 2, 0) / (n - 1));
    const rse = this.rses.reduce((a, v) => a + v, 0) / this.rses.length;
    const coverage = this.covered / n;
    const band = 2 * Math.sqrt(0.0475 / R);
    const inBand = Math.abs(coverage - 0.95) <= band ? 'yes' : 'no';
    return [
      scenario,
      name,
      String(n),
      String(this.failed),
      mean / truth - 1,
      rse,
      sd / mean,
      coverage,
      inBand,
    ];
  }
}

type Est = (rows: Uint8Array[]) => Outcome;
const closedEstimators: Record<string, Est> = {
  M0: (rows) => modelM0(summarise(rows), 0),
  Mt: (rows) => modelMt(summarise(rows), 0),
  Mb: (rows) => modelMb(summarise(rows), 0),
  'Chao (t−1)/t': (rows) => chaoMh(summarise(rows), 't-adjusted'),
  Chao: (rows) => chaoMh(summarise(rows), 'classic'),
  Jackknife: (rows) => {
    const s = summarise(rows);
    return jackknifeMh(s.f, s.t);
  },
};

function closedScenario(
  label: string,
  scenario: ClosedScenario,
  names: string[],
  R: number,
  seed: number,
  transform?: (rows: Uint8Array[], rng: SeededRandom) => Uint8Array[],
): (string | number)[][] {
  const rng = new SeededRandom(seed);
  const tallies = names.map(() => new Tally());
  for (let r = 0; r < R; r++) {
    let rows = simulateClosed(scenario, rng);
    if (transform) rows = transform(rows, rng);
    names.forEach((n, i) => tallies[i].add(closedEstimators[n](rows), scenario.N));
  }
  return names.map((n, i) => tallies[i].row(label, n, scenario.N, R));
}

function secrScenario(label: string, buffer: number, R: number, seed: number): (string | number)[] {
  const sigma = 50;
  const truth = 1.2;
  const traps = trapGrid(6, 6, 2 * sigma);
  const rng = new SeededRandom(seed);
  const tally = new Tally();
  for (let r = 0; r < R; r++) {
    const sim = simulateSecr(
      {
        traps,
        occasions: 5,
        detector: 'proximity',
        density: truth,
        g0OrLambda0: 0.2,
        sigma,
        buffer: 4 * sigma,
      },
      rng,
    );
    const fit = fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: buffer * sigma } });
    tally.add({ N: fit.D, se: fit.se, ci: fit.ci }, truth);
  }
  return tally.row(label, 'SECR D', truth, R);
}

/** Run every §7 scenario with R closed-model replicates and R_secr SECR replicates. */
export function runSimulationStudy(R: number, rSecr: number): void {
  console.log(
    `\nSimulation study (synthetic data, fixed seeds): R = ${R} closed, ${rSecr} SECR replicates`,
  );
  console.log(
    `Coverage band 0.95 ± 2·sqrt(0.0475/R) = ± ${(2 * Math.sqrt(0.0475 / R)).toFixed(3)} (closed)`,
  );
  const rows = [
    ...closedScenario(
      'no heterogeneity N=100 t=6 p=0.25',
      { N: 100, t: 6, p: 0.25 },
      ['M0', 'Mt', 'Chao (t−1)/t'],
      R,
      1,
    ),
    ...closedScenario(
      'logit-normal sd=1 N=100 t=6 p=0.2',
      { N: 100, t: 6, p: 0.2, logitSd: 1 },
      ['M0', 'Chao', 'Jackknife'],
      R,
      2,
    ),
    ...closedScenario(
      'trap-happy N=100 t=8 p=0.25 c=0.6',
      { N: 100, t: 8, p: 0.25, c: 0.6 },
      ['M0', 'Mb'],
      R,
      3,
    ),
    ...closedScenario(
      '5 % missed matches N=100 t=6 p=0.25',
      { N: 100, t: 6, p: 0.25 },
      ['M0', 'Chao'],
      R,
      4,
      (rows, rng) => addMissedMatches(rows, 0.05, rng),
    ),
    secrScenario('SECR 6×6 grid, 2σ spacing, buffer 4σ', 4, rSecr, 5),
    secrScenario('SECR violation: buffer 2σ', 2, rSecr, 5),
  ];
  printTable(
    [
      'scenario',
      'estimator',
      'fits',
      'failed',
      'rel.bias',
      'mean RSE',
      'emp. CV',
      'coverage',
      'in band',
    ],
    rows,
  );
}
