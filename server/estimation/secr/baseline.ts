/**
 * A deliberately straightforward SECR log-likelihood: every animal × mask point × trap × occasion
 * term is computed afresh. Used to check the factorised likelihood and as the benchmark baseline.
 */
import type { SecrInput } from './data';
import type { HabitatMask } from './mask';

/** Full log-likelihood at β = (log D [per ha], logit g0 | log λ0, log σ), no factorisation. */
export function naiveSecrLogLik(
  input: SecrInput,
  mask: HabitatMask,
  beta: readonly number[],
): number {
  const S = input.occasions;
  const K = input.traps.length;
  const usage = input.usage ?? input.traps.map(() => new Array<number>(S).fill(1));
  const trapIndex = new Map(input.traps.map((t, k) => [t.id, k]));
  const ids = [...new Set(input.captures.map((c) => c.animal))];
  const y = new Map(ids.map((id) => [id, new Float64Array(S * K)]));
  for (const c of input.captures) {
    const k = trapIndex.get(c.trap) ?? -1;
    const s = c.occasion - 1;
    if (!(usage[k][s] > 0)) continue;
    const row = y.get(c.animal);
    if (row) row[s * K + k] = input.detector === 'proximity' ? 1 : row[s * K + k] + 1;
  }
  const animals = [...y.values()].filter((row) => row.some((v) => v > 0));
  const D = Math.exp(beta[0]);
  const sigma = Math.exp(beta[2]);
  const scale = input.detector === 'proximity' ? 1 / (1 + Math.exp(-beta[1])) : Math.exp(beta[1]);
  const cellHa = (mask.spacing * mask.spacing) / 1e4;
  const logPr = (m: number, row: Float64Array | null): number => {
    let total = 0;
    for (let s = 0; s < S; s++) {
      for (let k = 0; k < K; k++) {
        const u = usage[k][s];
        if (u === 0) continue;
        const d2 = (mask.x[m] - input.traps[k].x) ** 2 + (mask.y[m] - input.traps[k].y) ** 2;
        const g = scale * Math.exp(-d2 / (2 * sigma * sigma));
        const yy = row ? row[s * K + k] : 0;
        if (input.detector === 'proximity') {
          const p = 1 - Math.pow(1 - g, u);
          total += yy > 0 ? Math.log(p) : Math.log(1 - p);
        } else {
          const mu = u * g;
          total += yy * Math.log(mu) - mu - logFactorial(yy);
        }
      }
    }
    return total;
  };
  let a = 0;
  for (let m = 0; m < mask.points; m++) a += 1 - Math.exp(logPr(m, null));
  a *= cellHa;
  let ll = animals.length * beta[0] - D * a;
  for (const row of animals) {
    let sum = 0;
    for (let m = 0; m < mask.points; m++) sum += Math.exp(logPr(m, row));
    ll += Math.log(sum * cellHa);
  }
  return ll;
}

function logFactorial(n: number): number {
  let s = 0;
  for (let i = 2; i <= n; i++) s += Math.log(i);
  return s;
}
