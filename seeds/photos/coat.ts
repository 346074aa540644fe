/**
 * Individuals of the target species and their coats. Each individual has two flank coats drawn
 * from independent streams (left and right differ, as real flanks do) plus a few visible traits
 * that stay the same in every photo and that a reviewer could type as notes.
 */
import {
  makeRing,
  makeRosette,
  makeScar,
  makeSpot,
  MarkGrid,
  type Ink,
  type Mark,
} from './coat-marks';
import { insideTrunk, LIMBS, TAIL } from './leopard-body';
import type { Rgb } from './raster';
import { hashString, Rng, rngFor } from './random';

/** Which side of the animal. A photo showing the animal's left side shows its left flank. */
export type Flank = 'left' | 'right';

/** Visible per-individual traits (the demo catalogue's ground truth for text search). */
export interface Traits {
  readonly earNotch: Flank | null;
  readonly tailKink: boolean;
  readonly scar: Flank | null;
  readonly shoulderCluster: Flank | null;
}

/** One target-species individual: everything needed to paint it the same way every time. */
export interface Individual {
  readonly id: string;
  readonly seed: number;
  readonly sex: 'female' | 'male';
  /** Nose-to-rump length in metres (the template's unit is this length). */
  readonly lengthM: number;
  /** Tail length in body-length units. */
  readonly tailLength: number;
  readonly ground: Rgb;
  readonly back: Rgb;
  readonly belly: Rgb;
  readonly centre: Rgb;
  readonly traits: Traits;
}

/** Traits as a reviewer would type them. */
export interface IndividualDescription {
  readonly id: string;
  readonly sex: 'female' | 'male';
  readonly tags: readonly string[];
  /** One line, e.g. "notched left ear, broken rosette cluster on right shoulder". */
  readonly note: string;
}

/** Marks of one flank, indexed per body part ('trunk', 'near-fore-0', ..., 'tail'). */
export interface FlankCoat {
  readonly parts: ReadonlyMap<string, MarkGrid>;
}

const SIDES: readonly Flank[] = ['left', 'right'];

/** Builds an individual from a numeric seed or a string id; traits may be pinned by overrides. */
export function makeIndividual(ref: number | string, overrides: Partial<Traits> = {}): Individual {
  const id = typeof ref === 'number' ? `seed-${ref >>> 0}` : ref;
  const seed = typeof ref === 'number' ? ref >>> 0 : hashString(ref);
  const rng = rngFor(seed, 'individual');
  const sex = rng.chance(0.5) ? 'female' : 'male';
  const gold = rng.range(0, 1);
  const ground: Rgb = [196 + gold * 14, 150 - gold * 22, 92 - gold * 30];
  const traits = drawTraits(rng.fork('traits'), overrides);
  return {
    id,
    seed,
    sex,
    lengthM: sex === 'male' ? rng.range(1.3, 1.45) : rng.range(1.1, 1.25),
    tailLength: rng.range(0.7, 0.82),
    ground,
    back: [ground[0] - 18, ground[1] - 26, ground[2] - 24],
    belly: [236, 228, 206],
    centre: [ground[0] - 45, ground[1] - 52, ground[2] - 38],
    traits,
  };
}

function drawTraits(rng: Rng, overrides: Partial<Traits>): Traits {
  const side = (p: number): Flank | null => (rng.chance(p) ? rng.pick(SIDES) : null);
  const drawn: Traits = {
    earNotch: side(0.4),
    tailKink: rng.chance(0.25),
    scar: side(0.35),
    shoulderCluster: side(0.45),
  };
  const fallback = rng.pick(SIDES);
  const traits = { ...drawn, ...overrides };
  const none = !traits.earNotch && !traits.tailKink && !traits.scar && !traits.shoulderCluster;
  // Every demo individual gets at least one typed-in mark, unless the caller pinned them all.
  if (none && Object.keys(overrides).length < 4) return { ...traits, shoulderCluster: fallback };
  return traits;
}

/** The individual's traits as short English tags and a one-line marking note. */
export function describeIndividual(ind: Individual): IndividualDescription {
  const t = ind.traits;
  const tags: string[] = [];
  if (t.earNotch) tags.push(`notched ${t.earNotch} ear`);
  if (t.tailKink) tags.push('kinked tail tip');
  if (t.scar) tags.push(`scar on ${t.scar} flank`);
  if (t.shoulderCluster) tags.push(`broken rosette cluster on ${t.shoulderCluster} shoulder`);
  return { id: ind.id, sex: ind.sex, tags, note: tags.join(', ') };
}

const coatCache = new Map<string, FlankCoat>();

/** The marks of one flank (memoised; the same individual and flank always give the same coat). */
export function flankCoat(ind: Individual, flank: Flank): FlankCoat {
  const key = `${ind.seed}:${ind.id}:${flank}:${JSON.stringify(ind.traits)}`;
  const hit = coatCache.get(key);
  if (hit) return hit;
  const rng = rngFor(ind.seed, `coat-${flank}`);
  const parts = new Map<string, MarkGrid>();
  parts.set('trunk', trunkCoat(rng.fork('trunk'), ind, flank));
  for (const side of ['near', 'far']) {
    for (const limb of LIMBS) {
      limb.lengths.forEach((len, i) => {
        const key = `${side}-${limb.key}-${i}`;
        parts.set(key, limbCoat(rng.fork(key), len, limb.radii[i], i, limb.key, side === 'far'));
      });
    }
  }
  parts.set('tail', tailCoat(rng.fork('tail'), ind.tailLength));
  const coat = { parts };
  if (coatCache.size > 64) coatCache.delete(coatCache.keys().next().value ?? '');
  coatCache.set(key, coat);
  return coat;
}

/** Coat ink on the trunk at body coordinates (units of body length), hard-edged; for checks. */
export function trunkInk(ind: Individual, flank: Flank, u: number, v: number): Ink {
  const grid = flankCoat(ind, flank).parts.get('trunk');
  const ink: Ink = { black: 0, centre: 0, scar: 0 };
  return grid ? grid.inkAt(u, v, 1e6, ink) : ink;
}

/** Accepted marks with their extents, bucketed for quick spacing checks. */
class Scatter {
  readonly marks: Mark[] = [];
  private readonly buckets = new Map<number, { x: number; y: number; e: number }[]>();

  fits(x: number, y: number, e: number, gap: number): boolean {
    const cx = Math.floor(x / 0.08);
    const cy = Math.floor(y / 0.08);
    for (let j = cy - 1; j <= cy + 1; j++) {
      for (let i = cx - 1; i <= cx + 1; i++) {
        for (const o of this.buckets.get(j * 1000 + i) ?? []) {
          const dx = o.x - x;
          const dy = o.y - y;
          const min = e + o.e + gap;
          if (dx * dx + dy * dy < min * min) return false;
        }
      }
    }
    return true;
  }

  add(m: Mark, extent: number): void {
    this.marks.push(m);
    const k = Math.floor(m.y / 0.08) * 1000 + Math.floor(m.x / 0.08);
    const list = this.buckets.get(k) ?? [];
    list.push({ x: m.x, y: m.y, e: extent });
    this.buckets.set(k, list);
  }
}

/** Mark size over the trunk: big rosettes on the flank, smaller on back and neck, tiny on the head. */
function trunkRadius(x: number, y: number): { r: number; rosette: number } {
  if (x > 0.86) return { r: 0.0075, rosette: 0 };
  if (x > 0.74) return { r: 0.01 + (0.86 - x) * 0.05, rosette: 0.1 };
  if (y < 0.275) return { r: 0.016, rosette: 0.15 };
  if (y > 0.48) return { r: 0.014, rosette: 0.35 };
  const mid = 1 - Math.abs(x - 0.42) / 0.5;
  return { r: 0.018 + 0.007 * mid, rosette: 0.92 };
}

function trunkCoat(rng: Rng, ind: Individual, flank: Flank): MarkGrid {
  const s = new Scatter();
  const scale = rng.range(0.88, 1.15);
  const ringWidth = rng.range(0.26, 0.34);
  if (ind.traits.shoulderCluster === flank) shoulderCluster(rng.fork('cluster'), s);
  for (let i = 0; i < 9000; i++) {
    const x = rng.range(-0.02, 1.05);
    const y = rng.range(0.2, 0.6);
    if (!insideTrunk(x, y, -0.004)) continue;
    const { r: r0, rosette } = trunkRadius(x, y);
    const r = r0 * (r0 > 0.013 ? scale : 1) * rng.range(0.75, 1.2);
    const isRosette = rng.chance(rosette);
    const extent = isRosette ? r * (1 + ringWidth) : r;
    const gap = r0 > 0.015 ? 0.007 : r0 * 0.9;
    if (!s.fits(x, y, extent, gap)) continue;
    s.add(isRosette ? makeRosette(rng, x, y, r, ringWidth) : makeSpot(rng, x, y, r), extent);
  }
  // Small filler dots between rosettes give texture at a finer scale.
  for (let i = 0; i < 4000; i++) {
    const x = rng.range(0, 0.86);
    const y = rng.range(0.25, 0.58);
    if (!insideTrunk(x, y, -0.006)) continue;
    const r = rng.range(0.004, 0.0075);
    if (!s.fits(x, y, r, 0.006)) continue;
    s.add(makeSpot(rng, x, y, r, 0.2), r);
  }
  if (ind.traits.scar === flank) {
    const scar = makeScar(
      rng,
      rng.range(0.3, 0.55),
      rng.range(0.34, 0.42),
      rng.range(0.1, 0.15),
      rng.range(-0.6, 0.6),
    );
    s.marks.push(scar);
  }
  return new MarkGrid(s.marks, -0.15, 0.1, 1.15, 0.7, 0.02);
}

/** A big broken ring of heavy blotches on the shoulder, easy to spot and to describe. */
function shoulderCluster(rng: Rng, s: Scatter): void {
  const cx = 0.6 + rng.range(-0.02, 0.02);
  const cy = 0.41 + rng.range(-0.015, 0.015);
  const big = makeRosette(rng, cx, cy, 0.055, 0.42);
  s.add(big, 0.08);
  const a = rng.range(0, Math.PI * 2);
  for (let k = 0; k < 2; k++) {
    const r = 0.016 + k * 0.004;
    const x = cx + Math.cos(a + k * 0.7) * 0.095;
    const y = cy + Math.sin(a + k * 0.7) * 0.08;
    s.add(makeSpot(rng, x, y, r, 0.3), r);
  }
}

function limbCoat(
  rng: Rng,
  len: number,
  radius: number,
  index: number,
  limb: string,
  far: boolean,
): MarkGrid {
  const s = new Scatter();
  const top = index === 0;
  const base = top ? (limb === 'hind' ? 0.017 : 0.013) : index === 1 ? 0.01 : 0.007;
  for (let i = 0; i < 900; i++) {
    const x = rng.range(-radius, len + radius);
    const y = rng.range(-radius, radius);
    const r = base * rng.range(0.7, 1.25) * (1 - (0.3 * x) / (len + radius));
    const rosette = top && limb === 'hind' && !far && rng.chance(0.5);
    const extent = rosette ? r * 1.3 : r;
    if (!s.fits(x, y, extent, r * 0.9)) continue;
    s.add(rosette ? makeRosette(rng, x, y, r, 0.28) : makeSpot(rng, x, y, r), extent);
  }
  return new MarkGrid(s.marks, -0.1, -0.1, len + 0.1, 0.1, 0.03);
}

function tailCoat(rng: Rng, length: number): MarkGrid {
  const s = new Scatter();
  const ringsFrom = length * rng.range(0.5, 0.6);
  for (let i = 0; i < 900; i++) {
    const x = rng.range(0, ringsFrom);
    const y = rng.range(-TAIL.radius0, TAIL.radius0);
    const r = rng.range(0.009, 0.016);
    if (!s.fits(x, y, r, 0.01)) continue;
    s.add(rng.chance(0.3) ? makeRosette(rng, x, y, r, 0.3) : makeSpot(rng, x, y, r), r);
  }
  for (let x = ringsFrom + 0.03; x < length - 0.05; x += rng.range(0.055, 0.07)) {
    s.marks.push(makeRing(rng, x, rng.range(0.011, 0.016)));
  }
  s.marks.push(makeRing(rng, length, 0.04));
  return new MarkGrid(s.marks, -0.05, -0.06, length + 0.1, 0.06, 0.03);
}
