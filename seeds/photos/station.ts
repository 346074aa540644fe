/**
 * The look of one camera at one station: habitat and palette come from the station (both
 * cameras of a pair stand in the same bush), layout from the station and camera (they face each
 * other across the trail, so each sees a different background).
 */
import type { Rgb } from './raster';
import { hashString, mix, Rng } from './random';

/** Broad vegetation type of a station. */
export type Habitat = 'woodland' | 'rocky' | 'grassland' | 'riverine';

/** Colours of a station's scene. */
export interface Palette {
  readonly skyLow: Rgb;
  readonly skyHigh: Rgb;
  readonly hills: Rgb;
  readonly treeLine: Rgb;
  readonly soil: Rgb;
  readonly soilDark: Rgb;
  readonly trail: Rgb;
  readonly grass: Rgb;
  readonly grassDry: Rgb;
  readonly foliage: Rgb;
  readonly foliageDark: Rgb;
  readonly bark: Rgb;
  readonly rock: Rgb;
}

/** A fixed object of the scene at ground position (x, z), metres. */
export interface SceneObject {
  readonly kind: 'trunk' | 'bush' | 'rock';
  readonly x: number;
  readonly z: number;
  /** Radius (trunk, rock) or half-width (bush), metres. */
  readonly size: number;
  readonly seed: number;
  readonly lean: number;
}

/** Everything that makes one camera's photos look alike. */
export interface StationLook {
  readonly key: string;
  readonly seed: number;
  readonly habitat: Habitat;
  readonly palette: Palette;
  readonly hfovDeg: number;
  readonly cameraHeightM: number;
  /** Trail centre line: z = trailZ + trailSlope * x, width in metres. */
  readonly trailZ: number;
  readonly trailSlope: number;
  readonly trailWidth: number;
  readonly treeLineZ: number;
  readonly hills: boolean;
  readonly grassDensity: number;
  readonly objects: readonly SceneObject[];
}

const PALETTES: Record<Habitat, Palette> = {
  woodland: {
    skyLow: [226, 230, 226],
    skyHigh: [170, 196, 222],
    hills: [132, 146, 150],
    treeLine: [76, 94, 58],
    soil: [150, 112, 78],
    soilDark: [110, 82, 58],
    trail: [184, 150, 112],
    grass: [130, 138, 70],
    grassDry: [190, 170, 112],
    foliage: [78, 104, 52],
    foliageDark: [44, 62, 32],
    bark: [92, 80, 70],
    rock: [140, 132, 122],
  },
  rocky: {
    skyLow: [232, 232, 226],
    skyHigh: [168, 192, 220],
    hills: [150, 140, 130],
    treeLine: [96, 104, 70],
    soil: [160, 118, 84],
    soilDark: [120, 90, 66],
    trail: [196, 164, 128],
    grass: [160, 152, 88],
    grassDry: [204, 184, 128],
    foliage: [92, 108, 60],
    foliageDark: [54, 66, 38],
    bark: [110, 96, 84],
    rock: [150, 140, 128],
  },
  grassland: {
    skyLow: [236, 236, 228],
    skyHigh: [160, 190, 224],
    hills: [140, 148, 150],
    treeLine: [100, 112, 66],
    soil: [168, 140, 96],
    soilDark: [130, 104, 72],
    trail: [200, 176, 136],
    grass: [176, 164, 96],
    grassDry: [214, 196, 140],
    foliage: [96, 116, 60],
    foliageDark: [58, 74, 40],
    bark: [100, 88, 76],
    rock: [156, 148, 136],
  },
  riverine: {
    skyLow: [220, 228, 224],
    skyHigh: [160, 190, 214],
    hills: [120, 136, 136],
    treeLine: [56, 80, 46],
    soil: [112, 92, 70],
    soilDark: [80, 66, 52],
    trail: [150, 126, 98],
    grass: [100, 130, 60],
    grassDry: [160, 160, 100],
    foliage: [62, 96, 44],
    foliageDark: [32, 54, 28],
    bark: [76, 68, 60],
    rock: [124, 120, 112],
  },
};

/** Shifts a colour a little, so stations of one habitat are not identical. */
function tint(c: Rgb, rng: Rng, amount: number): Rgb {
  const k = 1 + rng.range(-amount, amount);
  return [c[0] * k + rng.range(-6, 6), c[1] * k + rng.range(-6, 6), c[2] * k + rng.range(-6, 6)];
}

function tintPalette(p: Palette, rng: Rng): Palette {
  const t = (c: Rgb): Rgb => tint(c, rng, 0.06);
  return {
    skyLow: t(p.skyLow),
    skyHigh: t(p.skyHigh),
    hills: t(p.hills),
    treeLine: t(p.treeLine),
    soil: t(p.soil),
    soilDark: t(p.soilDark),
    trail: t(p.trail),
    grass: t(p.grass),
    grassDry: t(p.grassDry),
    foliage: t(p.foliage),
    foliageDark: t(p.foliageDark),
    bark: t(p.bark),
    rock: t(p.rock),
  };
}

/** The look of camera `camera` at station `station` (any string or number identifies them). */
export function stationLook(station: string | number, camera: string): StationLook {
  const stationSeed = typeof station === 'number' ? station >>> 0 : hashString(station);
  const site = new Rng(mix(stationSeed, 0x51));
  const habitat = site.pick<Habitat>([
    'woodland',
    'woodland',
    'rocky',
    'rocky',
    'grassland',
    'riverine',
  ]);
  const palette = tintPalette(PALETTES[habitat], site);
  const trailWidth = site.range(1.2, 2.6);
  const seed = mix(stationSeed, hashString(camera));
  const rng = new Rng(seed);
  const hfovDeg = rng.range(46, 56);
  const trailZ = rng.range(3, 5.5);
  return {
    key: `${stationSeed}:${camera}`,
    seed,
    habitat,
    palette,
    hfovDeg,
    cameraHeightM: rng.range(0.55, 0.95),
    trailZ,
    trailSlope: rng.range(-0.12, 0.12),
    trailWidth,
    treeLineZ: rng.range(18, 45),
    hills: habitat === 'rocky' ? rng.chance(0.8) : rng.chance(0.3),
    grassDensity: habitat === 'grassland' ? rng.range(1.4, 2) : rng.range(0.6, 1.3),
    objects: layoutObjects(rng, habitat, hfovDeg, trailZ, trailWidth),
  };
}

/** Trunks, bushes and rocks off the trail, inside the field of view. */
function layoutObjects(
  rng: Rng,
  habitat: Habitat,
  hfovDeg: number,
  trailZ: number,
  trailWidth: number,
): SceneObject[] {
  const half = Math.tan((hfovDeg * Math.PI) / 360);
  const objects: SceneObject[] = [];
  const place = (kind: SceneObject['kind'], zMin: number, zMax: number, size: () => number) => {
    for (let tries = 0; tries < 20; tries++) {
      const z = rng.range(zMin, zMax);
      const x = rng.range(-1.15, 1.15) * z * half;
      const onTrail = Math.abs(z - trailZ) < trailWidth / 2 + 0.6;
      if (onTrail) continue;
      objects.push({
        kind,
        x,
        z,
        size: size(),
        seed: rng.int(0, 2 ** 31),
        lean: rng.range(-0.08, 0.08),
      });
      return;
    }
  };
  const trunks =
    habitat === 'grassland' ? rng.int(0, 1) : rng.int(1, habitat === 'riverine' ? 4 : 3);
  for (let i = 0; i < trunks; i++) place('trunk', trailZ + 1.5, 16, () => rng.range(0.08, 0.26));
  const bushes = rng.int(3, habitat === 'grassland' ? 5 : 9);
  for (let i = 0; i < bushes; i++) place('bush', trailZ + 1, 22, () => rng.range(0.5, 1.6));
  const nearBushes = rng.int(0, 2);
  for (let i = 0; i < nearBushes; i++) place('bush', 1.8, trailZ - 0.5, () => rng.range(0.25, 0.5));
  const rocks = habitat === 'rocky' ? rng.int(3, 8) : rng.int(0, 2);
  for (let i = 0; i < rocks; i++) place('rock', 2, 14, () => rng.range(0.15, 0.7));
  return objects.sort((a, b) => b.z - a.z);
}
