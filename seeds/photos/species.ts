/**
 * Non-target species: simple side-view figures, easy to tell apart and without rosettes, so the
 * sorting step has realistic bycatch. Template metres, head towards +x, feet on y = 0.
 */
import { capsule, ellipse, type Figure, type Part, type ShadeInput } from './figure';
import { blend, eye, finish, fourLegs, put } from './figure-kit';
import { valueNoise } from './noise';
import type { Rgb } from './raster';
import type { Rng } from './random';
import type { OtherSpecies } from './types';

/** Names reported in the truth. */
export const SPECIES_NAMES: Record<OtherSpecies, { scientific: string; common: string }> = {
  bushbuck: { scientific: 'Tragelaphus scriptus', common: 'bushbuck' },
  porcupine: { scientific: 'Hystrix africaeaustralis', common: 'Cape porcupine' },
  honeyBadger: { scientific: 'Mellivora capensis', common: 'honey badger' },
  baboon: { scientific: 'Papio anubis', common: 'olive baboon' },
  genet: { scientific: 'Genetta genetta', common: 'common genet' },
};

/** The figure of one animal of a non-target species. */
export function speciesFigure(
  species: OtherSpecies,
  rng: Rng,
  gait: number,
  infrared: boolean,
): Figure {
  switch (species) {
    case 'bushbuck':
      return bushbuck(rng, gait, infrared);
    case 'porcupine':
      return porcupine(rng, gait, infrared);
    case 'honeyBadger':
      return honeyBadger(gait, infrared);
    case 'baboon':
      return baboon(gait, infrared);
    case 'genet':
      return genet(gait, infrared);
  }
}

function bushbuck(rng: Rng, gait: number, infrared: boolean): Figure {
  const male = rng.chance(0.5);
  const coat: Rgb = male ? [104, 64, 40] : [158, 88, 46];
  const white: Rgb = [236, 230, 218];
  const b = { blend: 0.06 };
  const parts: Part[] = [
    ellipse('body', [0.55, 0.64], 0.42, 0.19, 0, b),
    ellipse('body', [0.2, 0.64], 0.2, 0.2, 0, b),
    ellipse('body', [0.86, 0.62], 0.17, 0.18, 0, b),
    capsule('neck', [0.92, 0.72], [1.1, 0.96], 0.09, 0.06, b),
    ellipse('head', [1.15, 0.98], 0.1, 0.065, -0.5, { blend: 0.03 }),
    capsule('muzzle', [1.17, 0.96], [1.27, 0.87], 0.05, 0.034, { blend: 0.02 }),
    ellipse('ear', [1.07, 1.06], 0.075, 0.03, 0.6, { blend: 0.01 }),
    capsule('tail', [0.02, 0.74], [-0.06, 0.56], 0.045, 0.025, { blend: 0.02 }),
  ];
  if (male) parts.push(capsule('horn', [1.1, 1.04], [1.0, 1.32], 0.02, 0.006, { blend: 0.01 }));
  parts.push(
    ...fourLegs(
      {
        root: [0.86, 0.56],
        lengths: [0.27, 0.26],
        angles: [-1.56, -1.57],
        radii: [0.05, 0.028, 0.018],
      },
      {
        root: [0.2, 0.56],
        lengths: [0.26, 0.2, 0.14],
        angles: [-1.25, -2.0, -1.5],
        radii: [0.065, 0.032, 0.022, 0.018],
      },
      gait,
      0.05,
      { swing: 0.32 },
    ),
  );
  return {
    parts,
    pivotX: 0.55,
    lengthM: 1.25,
    shade(s: ShadeInput, out: Float32Array): void {
      put(out, coat);
      const n = s.part.name;
      if (n === 'horn') put(out, [40, 34, 30]);
      else if (n === 'muzzle') put(out, [60, 44, 36]);
      else if (n === 'tail' && s.y < 0.66) blend(out, white, 0.8);
      else if (n === 'leg' && s.y < 0.12) blend(out, s.y < 0.03 ? [30, 26, 24] : white, 0.8);
      else if (n === 'body') {
        // Thin white vertical stripes and rows of white spots: this species' own markings.
        const stripe = Math.abs(((s.x + 0.03 * Math.sin(s.y * 20)) % 0.13) - 0.065);
        if (s.y > 0.55 && s.y < 0.78 && s.x > 0.25 && s.x < 0.8 && stripe < 0.008)
          blend(out, white, 0.85);
        const sx = (s.x % 0.07) - 0.035;
        const sy = (s.y % 0.06) - 0.03;
        if (s.x < 0.32 && s.y < 0.68 && sx * sx + sy * sy < 0.00011) blend(out, white, 0.8);
      } else if (n === 'neck' && s.y < 0.8 && s.x > 0.97) blend(out, white, 0.7);
      eye(out, s, 1.16, 1.0, 0.014, infrared);
      finish(out, s, 0.08, 0.06);
    },
  };
}

function porcupine(rng: Rng, gait: number, infrared: boolean): Figure {
  const parts: Part[] = [
    ellipse('body', [0.36, 0.28], 0.36, 0.22, 0.05, { blend: 0.04 }),
    ellipse('head', [0.7, 0.17], 0.1, 0.075, -0.2, { blend: 0.04 }),
    ellipse('snout', [0.79, 0.13], 0.05, 0.04, -0.3, { blend: 0.02 }),
  ];
  // Long banded quills raised along the back give the spiky outline.
  for (let i = 0; i < 38; i++) {
    const a = Math.PI * (0.05 + 0.9 * (i / 37)) + rng.range(-0.05, 0.05);
    const len = rng.range(0.14, 0.3) * (0.6 + 0.6 * Math.sin(a));
    const sx = 0.36 + Math.cos(a) * 0.28;
    const sy = 0.28 + Math.sin(a) * 0.16;
    const tilt = a + (Math.PI / 2 - a) * 0.3 + 0.35;
    parts.push(
      capsule(
        'quill',
        [sx, sy],
        [sx + Math.cos(tilt) * len, sy + Math.sin(tilt) * len],
        0.009,
        0.002,
        { blend: 0.005 },
      ),
    );
  }
  parts.push(
    ...fourLegs(
      { root: [0.6, 0.12], lengths: [0.1], angles: [-1.5], radii: [0.04, 0.03] },
      { root: [0.15, 0.12], lengths: [0.1], angles: [-1.6], radii: [0.045, 0.032] },
      gait,
      0.03,
      { swing: 0.25 },
    ),
  );
  return {
    parts,
    pivotX: 0.4,
    lengthM: 0.8,
    shade(s: ShadeInput, out: Float32Array): void {
      const n = s.part.name;
      if (n === 'quill' || n === 'body') {
        // Black-and-white banding along the quills, radiating from the body centre.
        const dx = s.x - 0.36;
        const dy = s.y - 0.2;
        const r = Math.sqrt(dx * dx + dy * dy);
        const a = Math.atan2(dy, dx);
        const band = Math.sin(r * 70 + valueNoise(a * 20, 0, 5) * 6);
        put(out, band > 0.2 ? [226, 222, 214] : [24, 20, 18]);
      } else {
        put(out, [38, 32, 28]);
      }
      eye(out, s, 0.74, 0.19, 0.011, infrared);
      finish(out, s, 0.05, 0.05);
    },
  };
}

function honeyBadger(gait: number, infrared: boolean): Figure {
  const b = { blend: 0.04 };
  const parts: Part[] = [
    capsule('body', [0.14, 0.22], [0.52, 0.235], 0.11, 0.105, b),
    ellipse('head', [0.65, 0.215], 0.08, 0.065, -0.1, { blend: 0.04 }),
    capsule('snout', [0.68, 0.2], [0.76, 0.18], 0.045, 0.03, { blend: 0.02 }),
    capsule('tail', [0.04, 0.26], [-0.08, 0.3], 0.04, 0.022, { blend: 0.02 }),
    ...fourLegs(
      {
        root: [0.52, 0.16],
        lengths: [0.13, 0.04],
        angles: [-1.52, -0.2],
        radii: [0.05, 0.04, 0.03],
      },
      {
        root: [0.15, 0.16],
        lengths: [0.13, 0.04],
        angles: [-1.62, -0.2],
        radii: [0.055, 0.04, 0.03],
      },
      gait,
      0.03,
      { swing: 0.3 },
    ),
  ];
  return {
    parts,
    pivotX: 0.35,
    lengthM: 0.8,
    shade(s: ShadeInput, out: Float32Array): void {
      put(out, [26, 24, 24]);
      // Silver-grey mantle from the crown along the back to the tail.
      const line = 0.255 + 0.015 * Math.sin(s.x * 9) + (s.x > 0.6 ? (s.x - 0.6) * 0.35 : 0);
      const n = s.part.name;
      if ((n === 'body' || n === 'head' || n === 'tail') && s.y > line)
        blend(out, [206, 204, 194], Math.min(1, (s.y - line) * s.px + 0.2));
      eye(out, s, 0.69, 0.225, 0.009, infrared);
      finish(out, s, 0.05, 0.08);
    },
  };
}

function baboon(gait: number, infrared: boolean): Figure {
  const b = { blend: 0.06 };
  // Dog-like stance: shoulders above the hips, long limbs, head low and forward, tail in an arch.
  const parts: Part[] = [
    capsule('body', [0.14, 0.47], [0.5, 0.55], 0.11, 0.135, b),
    ellipse('mane', [0.55, 0.58], 0.11, 0.11, 0, b),
    ellipse('head', [0.72, 0.56], 0.075, 0.075, 0, { blend: 0.03 }),
    capsule('muzzle', [0.74, 0.53], [0.87, 0.47], 0.05, 0.034, { blend: 0.02 }),
    capsule('tail', [0.04, 0.5], [-0.04, 0.62], 0.03, 0.027, { blend: 0.02 }),
    capsule('tail', [-0.04, 0.62], [-0.12, 0.36], 0.027, 0.018, { blend: 0.01 }),
    ...fourLegs(
      {
        root: [0.52, 0.5],
        lengths: [0.24, 0.21, 0.07],
        angles: [-1.55, -1.6, 0],
        radii: [0.05, 0.035, 0.03, 0.026],
      },
      {
        root: [0.15, 0.44],
        lengths: [0.2, 0.2, 0.08],
        angles: [-1.25, -1.9, -0.05],
        radii: [0.06, 0.036, 0.03, 0.026],
      },
      gait,
      0.04,
      { swing: 0.3 },
    ),
  ];
  return {
    parts,
    pivotX: 0.35,
    lengthM: 0.85,
    shade(s: ShadeInput, out: Float32Array): void {
      const n = s.part.name;
      put(out, n === 'muzzle' ? [66, 60, 60] : [126, 116, 84]);
      if (n === 'mane') blend(out, [146, 136, 100], 0.5);
      if (n === 'leg' && s.y < 0.06) blend(out, [50, 46, 44], 0.8);
      eye(out, s, 0.76, 0.57, 0.01, infrared);
      finish(out, s, 0.07, 0.14);
    },
  };
}

function genet(gait: number, infrared: boolean): Figure {
  const b = { blend: 0.03 };
  const parts: Part[] = [
    capsule('body', [0.08, 0.17], [0.42, 0.18], 0.07, 0.065, b),
    ellipse('head', [0.52, 0.19], 0.06, 0.045, -0.1, { blend: 0.025 }),
    capsule('snout', [0.55, 0.18], [0.62, 0.165], 0.03, 0.014, { blend: 0.015 }),
    ellipse('ear', [0.49, 0.245], 0.018, 0.03, 0.3, { blend: 0.008 }),
  ];
  let [x, y] = [0.02, 0.18];
  for (let i = 0; i < 8; i++) {
    const a = Math.PI + 0.25 - i * 0.045;
    const nx = x + Math.cos(a) * 0.06;
    const ny = y + Math.sin(a) * 0.06;
    parts.push(
      capsule('tail', [x, y], [nx, ny], 0.033 - i * 0.0015, 0.031 - i * 0.0015, { blend: 0.004 }),
    );
    [x, y] = [nx, ny];
  }
  parts.push(
    ...fourLegs(
      {
        root: [0.4, 0.13],
        lengths: [0.07, 0.06],
        angles: [-1.5, -1.6],
        radii: [0.03, 0.02, 0.016],
      },
      {
        root: [0.1, 0.13],
        lengths: [0.07, 0.06],
        angles: [-1.3, -1.9],
        radii: [0.034, 0.02, 0.016],
      },
      gait,
      0.02,
      { swing: 0.3 },
    ),
  );
  return {
    parts,
    pivotX: 0.25,
    lengthM: 0.55,
    shade(s: ShadeInput, out: Float32Array): void {
      put(out, [188, 180, 160]);
      const n = s.part.name;
      if (n === 'tail') {
        if (Math.sin(-s.x * 100) > 0.1) blend(out, [28, 26, 24], 0.9);
      } else if (n === 'body') {
        // Lines of small solid spots and a dark crest along the spine.
        if (s.y > 0.225) blend(out, [30, 28, 26], 0.85);
        const row = Math.round((s.y - 0.11) / 0.028);
        const cy = 0.11 + row * 0.028;
        const cx = Math.round((s.x + row * 0.017) / 0.04) * 0.04 - row * 0.017;
        const d2 = (s.x - cx) ** 2 + (s.y - cy) ** 2;
        if (row >= 0 && row <= 3 && d2 < 0.000095) blend(out, [34, 30, 28], 0.9);
      } else if (n === 'snout' || n === 'leg') {
        blend(out, [60, 56, 52], 0.7);
      }
      eye(out, s, 0.55, 0.2, 0.008, infrared);
      finish(out, s, 0.04, 0.06);
    },
  };
}
