/** Plain-language SECR input guards and the assumptions shown beside every density. */
import type { PreparedSecr, SecrInput } from './data';

/** Assumptions shown beside every SECR result. */
export const SECR_ASSUMPTIONS = [
  'Activity centres are spread at random (Poisson) over the habitat, and the population is closed during the session.',
  'Detection falls off with distance from an animal’s activity centre as a half-normal curve.',
  'Every animal was identified correctly and detections are independent.',
  'Reporting to a wildlife authority follows that authority’s standards and a qualified analyst’s review.',
];

/** Warnings about the data before fitting: zero-usage traps, dropped detections, few animals. */
export function inputWarnings(input: SecrInput, data: PreparedSecr): string[] {
  const out: string[] = [];
  const idle = input.traps.filter((_, k) => data.totalUsage[k] === 0).map((t) => t.id);
  if (idle.length > 0) {
    out.push(
      `${idle.length} trap(s) were never working (${idle.slice(0, 10).join(', ')}${idle.length > 10 ? ', …' : ''}); they add nothing to the estimate.`,
    );
  }
  if (data.droppedAtZeroUsage > 0) {
    out.push(
      `${data.droppedAtZeroUsage} detection(s) fell on a trap and occasion marked as not working and were left out; check the effort records.`,
    );
  }
  if (data.duplicateProximity > 0) {
    out.push(
      `${data.duplicateProximity} repeat detection(s) of the same animal at the same trap and occasion were counted once (proximity detectors record detected or not).`,
    );
  }
  const n = data.animals.length;
  const r = data.detections - n;
  if (n > 0 && (n < 20 || r < 20)) {
    const rse = Math.round(100 / Math.sqrt(Math.max(Math.min(n, r), 1)));
    out.push(
      `Only ${n} animals and ${r} re-detections: expect a relative standard error of about 1/√min(n, r) ≈ ${rse} % (Efford & Boulanger 2019), so treat the density as rough.`,
    );
  }
  if (n > 0 && data.spatialRecaptures < 5 && data.spatialRecaptures > 0) {
    out.push(
      `Only ${data.spatialRecaptures} animal(s) were detected at more than one trap; the movement scale σ rests on very few data.`,
    );
  }
  return out;
}
