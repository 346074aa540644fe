import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { SecrResponse } from '../../../shared/estimate-api';
import { DetectionChart } from './detection-chart';
import { EstimateCautions } from './estimate-cautions';
import { formatInterval, formatNumber } from './estimate-format';
import type { CaptureRow, TrapRow } from './estimate-input';
import { TrapPlot } from './trap-plot';
import { WarningList } from './warning-list';

/** A relative change as a signed percentage; changes under 0.05 % read as "no change". */
function signedPercent(change: number): string {
  const pct = 100 * change;
  if (Math.abs(pct) < 0.05) return 'no change to 0.1 %';
  return `${pct > 0 ? '+' : '−'}${formatNumber(Math.abs(pct), 1)} %`;
}

/** SECR density result: D per km² and per 100 km², detection parameters, charts and cautions. */
@Component({
  selector: 'mac-secr-results',
  imports: [DetectionChart, EstimateCautions, TrapPlot, WarningList],
  templateUrl: './secr-results.html',
  styleUrl: './estimate-results.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SecrResults {
  readonly result = input.required<SecrResponse>();
  readonly traps = input.required<readonly TrapRow[]>();
  readonly captures = input.required<readonly CaptureRow[]>();

  /** g0 or λ0, whichever the detector has. */
  protected readonly scale = computed(() => {
    const r = this.result();
    const value = r.detector === 'proximity' ? r.g0 : r.lambda0;
    return value === null || value === undefined ? null : value;
  });

  protected readonly view = computed(() => {
    const r = this.result();
    const check = r.bufferCheck;
    return {
      D: formatNumber(r.D, 2),
      se: formatNumber(r.se, 2),
      ci: formatInterval(r.ci, 2),
      D100: formatNumber(r.densityPer100km2, 1),
      ci100: formatInterval(r.ciPer100km2, 1),
      sigma: formatNumber(r.sigma, 0),
      scaleName: r.detector === 'proximity' ? 'g0 (detection probability at 0 m)' : 'λ0',
      scale: formatNumber(this.scale(), 3),
      esa: formatNumber(r.esa, 3),
      mask: `${formatNumber(r.mask.spacing, 0)} m spacing, ${formatNumber(r.mask.buffer, 0)} m buffer, ${r.mask.points.toLocaleString('en')} points`,
      check: check
        ? `${formatNumber(check.D, 2)} per km² with a ${formatNumber(check.buffer, 0)} m buffer (${signedPercent(check.relativeChange)})`
        : 'not run',
    };
  });
}
