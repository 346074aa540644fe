/** People, vehicles and the set-up board: side-view figures in template metres, front to +x. */
import { box, capsule, ellipse, type Figure, type Part, type ShadeInput } from './figure';
import { blend, eye, finish, put, walkingLeg } from './figure-kit';
import type { Rgb } from './raster';
import type { Rng } from './random';

const SKIN: readonly Rgb[] = [
  [96, 62, 44],
  [128, 86, 60],
  [168, 120, 90],
  [206, 160, 128],
];
const CLOTH: readonly Rgb[] = [
  [70, 84, 52],
  [116, 104, 70],
  [40, 56, 90],
  [150, 40, 36],
  [200, 200, 196],
  [48, 48, 50],
  [176, 120, 50],
];

/** A person walking past, with skin, shirt, trousers, boots and sometimes a hat and backpack. */
export function humanFigure(rng: Rng, gait: number, infrared: boolean): Figure {
  const h = rng.range(1.58, 1.9) / 1.75;
  const skin = rng.pick(SKIN);
  const shirt = rng.pick(CLOTH);
  const trousers = rng.pick(CLOTH.filter((c) => c !== shirt));
  const hat = rng.chance(0.5) ? rng.pick(CLOTH) : null;
  const s = (v: number) => v * h;
  const parts: Part[] = [
    box('shirt', [0, s(1.2)], s(0.13), s(0.3), s(0.08), 0.04, { blend: s(0.03) }),
    capsule('skin', [s(0.01), s(1.48)], [s(0.02), s(1.56)], s(0.045), s(0.045), { blend: s(0.02) }),
    ellipse('head', [s(0.03), s(1.64)], s(0.095), s(0.115), 0, { blend: s(0.02) }),
    ellipse('skin', [s(0.115), s(1.62)], s(0.025), s(0.02), 0, { blend: s(0.01) }),
    box('trousers', [0, s(0.9)], s(0.12), s(0.09), s(0.05), 0, { blend: s(0.03) }),
  ];
  if (hat)
    parts.push(
      box('hat', [s(0.03), s(1.75)], s(0.14), s(0.025), s(0.01), 0.05),
      box('hat', [s(0.02), s(1.79)], s(0.09), s(0.05), s(0.03)),
    );
  if (rng.chance(0.5))
    parts.push(box('pack', [s(-0.17), s(1.22)], s(0.1), s(0.2), s(0.05), 0, { blend: s(0.01) }));
  for (const [layer, phase] of [
    [0, 0.5],
    [1, 0],
  ] as const) {
    const p = (gait + phase) % 1;
    parts.push(
      ...walkingLeg(
        'trousers',
        [0, s(0.9)],
        [s(0.44), s(0.44)],
        [-1.57, -1.57],
        [s(0.075), s(0.055), s(0.045)],
        p,
        { layer, swing: 0.35, fold: 0.5 },
      ),
    );
    const arm = walkingLeg(
      'shirt',
      [0, s(1.42)],
      [s(0.3), s(0.28)],
      [-1.57, -1.4],
      [s(0.05), s(0.042), s(0.035)],
      (p + 0.5) % 1,
      { layer, swing: 0.3, fold: -0.3 },
    );
    parts.push(...arm);
    const end = arm[arm.length - 1].shape;
    if (end.kind === 'capsule')
      parts.push(ellipse('skin', [end.bx, end.by], s(0.04), s(0.05), 0, { layer, blend: s(0.01) }));
  }
  return {
    parts,
    pivotX: 0,
    lengthM: 0.5,
    shade(inp: ShadeInput, out: Float32Array): void {
      const n = inp.part.name;
      put(
        out,
        n === 'shirt' || n === 'pack'
          ? shirt
          : n === 'trousers'
            ? trousers
            : n === 'hat' && hat
              ? hat
              : skin,
      );
      if (n === 'pack') blend(out, [30, 30, 30], 0.4);
      if (n === 'trousers' && inp.y < s(0.1)) put(out, [40, 34, 30]);
      if (n === 'head' && inp.y > s(1.68) && inp.x < s(0.06)) blend(out, [30, 24, 20], 0.9);
      if (n === 'head') eye(out, inp, s(0.09), s(1.66), s(0.008), false);
      finish(out, inp, s(0.06), 0.05);
      // Cotton and skin both reflect infrared strongly: people look pale at night.
      if (infrared) blend(out, [200, 200, 200], 0.35);
    },
  };
}

/** A field vehicle (a pickup with a cab) in one of a few fleet colours. */
export function vehicleFigure(rng: Rng, infrared: boolean): Figure {
  const paint = rng.pick<Rgb>([
    [226, 226, 220],
    [176, 160, 120],
    [70, 90, 64],
    [130, 130, 128],
  ]);
  const parts: Part[] = [
    box('body', [0, 0.86], 2.3, 0.42, 0.12),
    box('cab', [0.55, 1.52], 0.95, 0.34, 0.14, 0, { blend: 0.05 }),
    box('bumper', [2.32, 0.6], 0.12, 0.1, 0.04),
    box('bumper', [-2.32, 0.6], 0.1, 0.1, 0.04),
    ellipse('wheel', [1.5, 0.38], 0.38, 0.38),
    ellipse('wheel', [-1.45, 0.38], 0.38, 0.38),
  ];
  return {
    parts,
    pivotX: 0,
    lengthM: 4.8,
    shade(inp: ShadeInput, out: Float32Array): void {
      const n = inp.part.name;
      const { x, y } = inp;
      if (n === 'wheel') {
        const cx = x > 0 ? 1.5 : -1.45;
        const r = Math.sqrt((x - cx) ** 2 + (y - 0.38) ** 2);
        put(out, r < 0.2 ? [150, 150, 146] : r < 0.23 ? [60, 60, 60] : [26, 26, 26]);
      } else if (n === 'bumper') {
        put(out, [40, 40, 40]);
      } else {
        put(out, paint);
        const window =
          n === 'cab' && y > 1.38 && y < 1.75 && ((x > 0.7 && x < 1.35) || (x > -0.3 && x < 0.6));
        if (window) put(out, infrared ? [40, 40, 40] : [52, 64, 72]);
        if (n === 'body' && Math.abs(y - 0.95) < 0.01) blend(out, [20, 20, 20], 0.6);
        if (n === 'body' && x > 2.15 && y > 0.95 && y < 1.1) put(out, [240, 236, 200]);
        if (y < 0.55) blend(out, [20, 20, 20], 0.35);
      }
      finish(out, inp, 0.15, 0.02);
    },
  };
}

/** The whiteboard on a stake shown to the camera at set-up; its text is drawn afterwards. */
export function boardFigure(): Figure {
  const parts: Part[] = [
    capsule('post', [0, 0], [0, 0.75], 0.025, 0.025),
    box('board', [0, 0.95], 0.34, 0.25, 0.02),
  ];
  return {
    parts,
    pivotX: 0,
    lengthM: 0.7,
    shade(inp: ShadeInput, out: Float32Array): void {
      const edge = Math.abs(inp.x) > 0.31 || Math.abs(inp.y - 0.95) > 0.22;
      const n = inp.part.name;
      put(out, n === 'post' ? [110, 90, 70] : edge ? [90, 90, 96] : [238, 238, 232]);
    },
  };
}

/** Board area (template metres) where the set-up text goes. */
export const BOARD_TEXT_AREA = { x0: -0.28, x1: 0.28, y0: 0.76, y1: 1.14 };
