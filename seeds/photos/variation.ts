/** Neutral defaults and random draws for the per-photo variation. */
import { Rng } from './random';
import type { StationLook } from './station';
import type { SubjectKind, Variation } from './types';

/** Fills missing variation fields with neutral values (on the trail, side-on, sharp, unhidden). */
export function resolveVariation(
  partial: Partial<Variation> | undefined,
  look: StationLook,
  kind: SubjectKind,
): Variation {
  const position = clamp(partial?.position ?? 0, -1.5, 1.5);
  const half = Math.tan((look.hfovDeg * Math.PI) / 360);
  // Default distance puts the subject on the trail line z = trailZ + slope·x, x = position·z·half·0.8.
  const onTrail = look.trailZ / (1 - look.trailSlope * position * half * 0.8);
  const fallback = kind === 'setup' ? 1.6 : kind === 'vehicle' ? onTrail + 1.5 : onTrail;
  return {
    distanceM: clamp(partial?.distanceM ?? fallback, 0.8, 40),
    position,
    yawDeg: clamp(partial?.yawDeg ?? 0, -60, 60),
    rollDeg: clamp(partial?.rollDeg ?? 0, -20, 20),
    gait: (((partial?.gait ?? 0.15) % 1) + 1) % 1,
    motionBlur: clamp(partial?.motionBlur ?? 0, 0, 0.2),
    occlusion: clamp(partial?.occlusion ?? 0, 0, 0.5),
    mirror: partial?.mirror ?? false,
    exposure: clamp(partial?.exposure ?? 1, 0.3, 2),
    wind: clamp(partial?.wind ?? 0.3, 0, 1),
  };
}

function clamp(v: number, lo: number, hi: number): number {
  if (!Number.isFinite(v)) throw new Error(`variation value must be a finite number, got ${v}`);
  return Math.min(hi, Math.max(lo, v));
}

/**
 * A plausible random variation for demo sets: mostly side-on passes at trail distance, now and
 * then close, far, turned, blurred or partly hidden. `strength` 0–1 widens every range.
 */
export function randomVariation(
  seed: number,
  strength = 0.5,
  kind: SubjectKind = 'target',
): Partial<Variation> {
  const rng = new Rng(seed ^ 0x7a11);
  const s = Math.max(0, Math.min(1, strength));
  const v: {
    -readonly [K in keyof Variation]?: Variation[K];
  } = {
    position: rng.range(-0.55, 0.55) * (0.6 + s),
    yawDeg: rng.normal(8 + 20 * s),
    rollDeg: rng.normal(1 + 4 * s),
    gait: rng.next(),
    motionBlur: rng.chance(0.15 + 0.25 * s) ? rng.range(0.005, 0.01 + 0.04 * s) : 0,
    occlusion: rng.chance(0.1 + 0.3 * s) ? rng.range(0.05, 0.1 + 0.15 * s) : 0,
    exposure: 1 + rng.normal(0.05 + 0.1 * s),
    wind: rng.range(0, 0.4 + 0.6 * s),
  };
  if (kind !== 'blank' && rng.chance(0.25 * s + 0.1)) v.distanceM = rng.range(2.2, 4 + 8 * s);
  return v;
}
