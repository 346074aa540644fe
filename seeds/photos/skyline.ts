/**
 * The distant tree line: a low understory with flat-bottomed crowns on bare trunks above it, in
 * metres at the tree-line distance, so each column of the image can ask what it shows at a height.
 */
import { noise1 } from './noise';
import { Rng } from './random';

/** One tree of the distant line. */
interface Crown {
  readonly x: number;
  readonly halfWidth: number;
  /** Height of the crown's centre and its half-height, metres. */
  readonly centre: number;
  readonly halfHeight: number;
  readonly trunk: number;
  readonly seed: number;
}

/** What a column of the tree line shows: understory top and crown spans, metres above ground. */
export interface SkylineColumn {
  understory: number;
  spans: number[];
  trunk: boolean;
}

/** The tree line of one camera view. */
export class Skyline {
  private readonly crowns: Crown[] = [];

  constructor(
    private readonly seed: number,
    halfWidthM: number,
    density: number,
  ) {
    const rng = new Rng(seed ^ 0x5c11);
    let x = -halfWidthM - 4;
    while (x < halfWidthM + 4) {
      x += rng.range(2, 9) / density;
      if (rng.chance(0.25)) continue;
      const halfWidth = rng.range(2.2, 5.5);
      const halfHeight = halfWidth * rng.range(0.3, 0.5);
      const top = rng.range(4.5, 9);
      this.crowns.push({
        x,
        halfWidth,
        centre: top - halfHeight,
        halfHeight,
        trunk: rng.range(0.12, 0.3),
        seed: rng.int(0, 2 ** 30),
      });
    }
  }

  /** The column at lateral position x (metres at the tree-line distance). */
  column(x: number, out: SkylineColumn): SkylineColumn {
    out.understory = 1.0 + 1.6 * noise1(x * 0.35, this.seed) + 0.5 * noise1(x * 2.5, this.seed + 1);
    out.spans.length = 0;
    out.trunk = false;
    for (const c of this.crowns) {
      const d = (x - c.x) / c.halfWidth;
      if (Math.abs(x - c.x) < c.trunk * (0.6 + 0.4 * noise1(x * 8, c.seed))) out.trunk = true;
      if (d <= -1 || d >= 1) continue;
      // Ragged edges: the crown outline wobbles along its width.
      const half = c.halfHeight * Math.sqrt(1 - d * d) * (0.8 + 0.4 * noise1(x * 3, c.seed));
      out.spans.push(c.centre - half * 0.7, c.centre + half);
    }
    return out;
  }

  /** Highest trunk top (trunks end inside their crowns). */
  trunkTop(x: number): number {
    let top = 0;
    for (const c of this.crowns) if (Math.abs(x - c.x) < c.trunk) top = Math.max(top, c.centre);
    return top;
  }
}
