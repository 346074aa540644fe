/** Simulate closed-population capture histories (synthetic data for tests and benchmarks). */
import { SeededRandom } from './numeric/random';

/** A closed-population scenario: N animals, t occasions, capture probabilities. */
export interface ClosedScenario {
  N: number;
  t: number;
  /** Mean capture probability (constant when `logitSd` is 0 or absent). */
  p: number;
  /** Standard deviation of individual logit(p) (logit-normal heterogeneity). */
  logitSd?: number;
  /** Recapture probability after first capture (behavioural response); default p. */
  c?: number;
}

/** Histories of the animals caught at least once, as 0/1 rows. */
export function simulateClosed(s: ClosedScenario, rng: SeededRandom): Uint8Array[] {
  const out: Uint8Array[] = [];
  const mu = Math.log(s.p / (1 - s.p));
  for (let i = 0; i < s.N; i++) {
    const pi = s.logitSd ? 1 / (1 + Math.exp(-(mu + s.logitSd * rng.normal()))) : s.p;
    const ci = s.c ?? pi;
    const row = new Uint8Array(s.t);
    let caught = false;
    for (let j = 0; j < s.t; j++) {
      if (rng.uniform() < (caught ? ci : pi)) {
        row[j] = 1;
        caught = true;
      }
    }
    if (caught) out.push(row);
  }
  return out;
}

/** Split a share of animals' later captures into new identities ("ghosts" from missed matches). */
export function addMissedMatches(
  rows: Uint8Array[],
  share: number,
  rng: SeededRandom,
): Uint8Array[] {
  const out: Uint8Array[] = [];
  for (const row of rows) {
    const caughtOn = [...row.keys()].filter((j) => row[j] === 1);
    if (caughtOn.length >= 2 && rng.uniform() < share) {
      const cut = caughtOn[1 + rng.integer(caughtOn.length - 1)];
      const a = row.map((v, j) => (j < cut ? v : 0));
      const b = row.map((v, j) => (j >= cut ? v : 0));
      out.push(a, b);
    } else out.push(row);
  }
  return out;
}
