/** Simulate SECR data (synthetic, for tests and benchmarks): Poisson activity centres, half-normal detection. */
import { SeededRandom } from '../numeric/random';
import type { SecrInput } from './data';

/** Settings of a simulated SECR survey. */
export interface SecrScenario {
  traps: { id: string; x: number; y: number }[];
  occasions: number;
  detector: 'proximity' | 'count';
  /** Animals per hectare. */
  density: number;
  g0OrLambda0: number;
  sigma: number;
  /** Region around the traps where centres are placed (metres). */
  buffer: number;
  usage?: number[][];
}

/** A square grid of traps, `nx` × `ny`, with the given spacing (metres). */
export function trapGrid(
  nx: number,
  ny: number,
  spacing: number,
): { id: string; x: number; y: number }[] {
  const out: { id: string; x: number; y: number }[] = [];
  for (let j = 0; j < ny; j++)
    for (let i = 0; i < nx; i++)
      out.push({ id: `T${j * nx + i + 1}`, x: i * spacing, y: j * spacing });
  return out;
}

/** One simulated survey; `centres` is returned so tests can compare with the truth. */
export function simulateSecr(
  scenario: SecrScenario,
  rng: SeededRandom,
): SecrInput & { populationSize: number } {
  const xs = scenario.traps.map((t) => t.x);
  const ys = scenario.traps.map((t) => t.y);
  const x0 = Math.min(...xs) - scenario.buffer;
  const y0 = Math.min(...ys) - scenario.buffer;
  const w = Math.max(...xs) + scenario.buffer - x0;
  const h = Math.max(...ys) + scenario.buffer - y0;
  const N = rng.poisson((scenario.density * w * h) / 1e4);
  const captures: SecrInput['captures'] = [];
  const twoS2 = 2 * scenario.sigma ** 2;
  for (let i = 0; i < N; i++) {
    const cx = x0 + rng.uniform() * w;
    const cy = y0 + rng.uniform() * h;
    scenario.traps.forEach((t, k) => {
      const g = scenario.g0OrLambda0 * Math.exp(-((cx - t.x) ** 2 + (cy - t.y) ** 2) / twoS2);
      for (let s = 0; s < scenario.occasions; s++) {
        const u = scenario.usage?.[k][s] ?? 1;
        if (u === 0) continue;
        const count =
          scenario.detector === 'proximity'
            ? rng.bernoulli(1 - Math.pow(1 - g, u))
            : rng.poisson(u * g);
        for (let c = 0; c < count; c++)
          captures.push({ animal: `A${i + 1}`, occasion: s + 1, trap: t.id });
      }
    });
  }
  return {
    traps: scenario.traps,
    occasions: scenario.occasions,
    detector: scenario.detector,
    captures,
    usage: scenario.usage,
    populationSize: N,
  };
}
