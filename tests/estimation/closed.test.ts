import { describe, expect, it } from 'vitest';
import { estimateClosed } from '../../server/estimation/closed';
import { closureP } from '../../server/estimation/closure-test';
import { jackknifeMh } from '../../server/estimation/jackknife';
import { parseHistories, summarise } from '../../server/estimation/summary';
import type { ModelEstimate } from '../../shared/estimate';
import {
  COTTONTAILS,
  DEER_MICE,
  historiesFromFrequencies,
  historiesFromOccasionSummary,
} from './fixtures/published-data';

const byName = (models: ModelEstimate[], name: string): ModelEstimate => {
  const m = models.find((x) => x.model === name);
  if (!m) throw new Error(`model ${name} missing`);
  return m;
};

describe('deer mice (Otis et al. 1978; summaries from Amstrup, McDonald & Manly 2005, p. 25)', () => {
  // Histories constructed to reproduce the published n_j, u_j, m_j, which is all these estimators use.
  const histories = historiesFromOccasionSummary(DEER_MICE.u, DEER_MICE.m);
  const result = estimateClosed(histories, { huggins: true });

  it('should reproduce the published summary statistics [P]', () => {
    const s = summarise(parseHistories(histories));
    expect(s.n).toEqual(DEER_MICE.n);
    expect(s.u).toEqual(DEER_MICE.u);
    expect(s.m).toEqual(DEER_MICE.m);
    expect(s.S).toBe(38);
  });

  it('should give the estimating-equation roots M0 38.4713, Mt 38.4026, Mb 42.2557 [D]', () => {
    expect(byName(result.models, 'M0').N).toBeCloseTo(38.4713, 4); // [D]
    expect(byName(result.models, 'Mt').N).toBeCloseTo(38.4026, 4); // [D]
    const mb = byName(result.models, 'Mb');
    expect(mb.N).toBeCloseTo(42.2557, 4); // [D]
    expect(mb.params?.p).toBeCloseTo(0.3179, 5); // p̂ 0.31790 [D]
    expect(mb.params?.c).toBeCloseTo(0.61194, 5); // ĉ 0.61194 [D]
  });

  it('should equal the Huggins conditional estimates in M0, Mt and Mb [D]', () => {
    for (const form of ['M0', 'Mt', 'Mb']) {
      const root = byName(result.models, form).N ?? NaN;
      expect(byName(result.models, `Huggins-${form}`).N).toBeCloseTo(root, 6);
    }
  });

  it('should flag Schnabel 35.2927 and Schumacher–Eschmeyer 36.2726 as below S [D]', () => {
    const sch = byName(result.models, 'Schnabel');
    const se = byName(result.models, 'Schumacher-Eschmeyer');
    expect(sch.N).toBeCloseTo(35.2927, 4); // [D]
    expect(se.N).toBeCloseTo(36.2726, 4); // [D]
    expect(sch.warnings.join(' ')).toMatch(/below the 38 animals/);
    expect(se.warnings.join(' ')).toMatch(/below the 38 animals/);
  });

  it('should select Mb by AICc with n = S [D]', () => {
    expect(result.aiccTable.rows[0].model).toBe('Mb'); // [D]
    expect(result.aiccTable.n).toBe(38);
    expect(result.aiccTable.rows.every((r) => !r.model.startsWith('Huggins'))).toBe(true);
    expect(result.conditionalAiccTable?.rows.every((r) => r.model.startsWith('Huggins'))).toBe(
      true,
    );
  });

  it('should keep every log-normal lower limit at or above S', () => {
    for (const m of result.models)
      if (m.ci && m.N !== null && m.N >= 38) expect(m.ci[0]).toBeGreaterThanOrEqual(38);
  });

  it('should place the full-likelihood maximum where the continuous profile peaks', () => {
    const mb = byName(result.models, 'Mb');
    // The full-likelihood Mb maximum differs slightly from the root (convention documented).
    expect(Number(mb.params?.fullLikelihoodN)).toBeGreaterThan(38);
    expect(Number(mb.params?.fullLikelihoodN)).not.toBeCloseTo(mb.N ?? 0, 1);
  });
});

describe('cottontails (Edwards & Eberhardt 1967)', () => {
  // Histories constructed to reproduce the published f_k (from memory), which is all Mh estimators use.
  const histories = historiesFromFrequencies(COTTONTAILS.f, COTTONTAILS.t);
  const s = summarise(parseHistories(histories));

  it('should reproduce the jackknife sequence 116.6, 141.5, 158.6, 170.3, 176.5 [P-mem]', () => {
    expect(s.S).toBe(76);
    const jk = jackknifeMh(s.f, s.t);
    const seq = jk.params?.sequence as number[];
    // Burnham & Overton 1979 (from memory), published to one decimal
    [116.6, 141.5, 158.6, 170.3, 176.5].forEach((v, i) =>
      expect(Math.abs(seq[i] - v)).toBeLessThan(0.15),
    );
  });

  it('should give Chao 1987 = 133.78 [D]', () => {
    const r = estimateClosed(histories, { mixture: false });
    expect(byName(r.models, 'Mh-chao').N).toBeCloseTo(133.78, 2); // [D]
  });
});

describe('guards and edge cases', () => {
  it('should switch to the bias-corrected Chao form when f2 = 0 and say so', () => {
    // Synthetic: 10 animals caught once, 3 caught three times, none twice.
    const h = [...Array(10).fill('100000'), '111000', '011100', '001110'].map((x, i) =>
      i < 10 ? x.slice(6 - (i % 6)) + x.slice(0, 6 - (i % 6)) : x,
    );
    const r = estimateClosed(h, { mixture: false });
    const chao = byName(r.models, 'Mh-chao');
    expect(chao.params?.form).toBe('bias-corrected');
    // S + ((t−1)/t) f1(f1−1)/(2(f2+1)) with S = 13, t = 6, f1 = 10, f2 = 0
    expect(chao.N).toBeCloseTo(13 + ((5 / 6) * (10 * 9)) / 2, 10);
    expect(chao.warnings.join(' ')).toMatch(/f2 = 0/);
  });

  it('should report Mb as not estimable when first captures do not decline', () => {
    // Synthetic: first captures rise over the occasions (u = 1, 2, 3, 4).
    const h = ['1111', '0111', '0110', '0011', '0010', '0011', '0001', '0001', '0001', '0001'];
    const r = estimateClosed(h, { mixture: false });
    const mb = byName(r.models, 'Mb');
    expect(mb.N).toBeNull();
    expect(mb.reason).toMatch(/Mb cannot be estimated/);
    expect(r.aiccTable.rows.some((row) => row.model === 'Mb')).toBe(false);
  });

  it('should report no estimate when nobody was recaptured', () => {
    const r = estimateClosed(['10000', '01000', '00100', '00010', '00001'], { mixture: false });
    for (const name of ['M0', 'Mt', 'Schnabel']) expect(byName(r.models, name).N).toBeNull();
    expect(r.warnings.join(' ')).toMatch(/relative standard error/);
  });

  it('should warn about fewer than 5 occasions and few animals with the expected RSE', () => {
    const r = estimateClosed(['1100', '0110', '1010', '0011', '1000', '0100'], { mixture: false });
    expect(r.warnings.some((w) => /fewer than 5/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /1\/√min\(n, r\) ≈/.test(w))).toBe(true);
  });

  it('should accept histories as number rows and give the same result as strings', () => {
    const strings = historiesFromOccasionSummary(DEER_MICE.u, DEER_MICE.m);
    const rows = strings.map((h) => [...h].map(Number));
    const a = estimateClosed(strings, { mixture: false });
    const b = estimateClosed(rows, { mixture: false });
    expect(b.models.map((m) => m.N)).toEqual(a.models.map((m) => m.N));
  });

  it('should reject ragged histories and symbols other than 0/1', () => {
    expect(() => estimateClosed(['101', '11'])).toThrow(/occasions/);
    expect(() => estimateClosed(['101', '1x1'])).toThrow(/other than 0 and 1/);
    expect(() => estimateClosed(['101', '000'])).toThrow(/all zeros/);
  });

  it('should give P = 0.65 for a closure-test z of 0.39 (Simcharoen et al. 2007) [P]', () => {
    expect(closureP(0.39)).toBeCloseTo(0.65, 2); // [P]
  });

  it('should detect a population that was not closed (synthetic arrivals and departures)', () => {
    // Synthetic: half the animals present only in the first half, half only in the second.
    const h: string[] = [];
    for (let i = 0; i < 40; i++) {
      const row = Array(12).fill('0');
      const base = i < 20 ? 0 : 6;
      row[base + (i % 6)] = '1';
      row[base + ((i + 2) % 6)] = '1';
      if (i % 3 === 0) row[base + ((i + 4) % 6)] = '1';
      h.push(row.join(''));
    }
    const r = estimateClosed(h, { mixture: false });
    expect(r.closureTest?.p).toBeLessThan(0.05);
    expect(r.warnings.join(' ')).toMatch(/closure test/);
  });
});
