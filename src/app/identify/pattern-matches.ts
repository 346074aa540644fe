import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { PatternMatchesView } from '../../../shared/identify';

/** Drawing height of both photos, in SVG units. */
const H = 1000;
const GAP = 40;

/**
 * The sighting's photo and a reference photo side by side with the coat-pattern point pairs the
 * server verified: a dot on each photo and a line joining them.
 */
@Component({
  selector: 'mac-pattern-matches',
  template: `
    @if (layout(); as l) {
      <svg
        [attr.viewBox]="'0 0 ' + l.width + ' ' + height"
        role="img"
        [attr.aria-label]="label()"
        data-testid="pattern-matches"
      >
        <image
          [attr.href]="sightingUrl()"
          x="0"
          y="0"
          [attr.width]="l.left"
          [attr.height]="height"
        />
        <image
          [attr.href]="referenceUrl()"
          [attr.x]="l.left + gap"
          y="0"
          [attr.width]="l.right"
          [attr.height]="height"
        />
        @for (line of l.lines; track $index) {
          <line [attr.x1]="line[0]" [attr.y1]="line[1]" [attr.x2]="line[2]" [attr.y2]="line[3]" />
          <circle [attr.cx]="line[0]" [attr.cy]="line[1]" r="7" />
          <circle [attr.cx]="line[2]" [attr.cy]="line[3]" r="7" />
        }
      </svg>
    }
  `,
  styles: `
    svg {
      width: 100%;
      height: auto;
      display: block;
      border-radius: 10px;
    }
    line {
      stroke: var(--mat-sys-tertiary, #2e7d32);
      stroke-width: 2.5;
      stroke-opacity: 0.75;
    }
    circle {
      fill: none;
      stroke: var(--mat-sys-tertiary, #2e7d32);
      stroke-width: 3;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PatternMatches {
  readonly matches = input.required<PatternMatchesView>();
  readonly sightingUrl = input.required<string>();
  readonly referenceUrl = input.required<string>();
  protected readonly height = H;
  protected readonly gap = GAP;
  protected readonly label = computed(
    () => `${this.matches().inliers} matching points between the sighting and the reference`,
  );
  protected readonly layout = computed(() => {
    const m = this.matches();
    const left = (H * m.sightingPhoto.width) / m.sightingPhoto.height;
    const right = (H * m.referencePhoto.width) / m.referencePhoto.height;
    const lines = m.pairs.map(
      ([qx, qy, rx, ry]) => [qx * left, qy * H, left + GAP + rx * right, ry * H] as const,
    );
    return { left, right, width: left + GAP + right, lines };
  });
}
