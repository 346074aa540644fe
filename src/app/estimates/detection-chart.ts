import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';
import { formatNumber } from './estimate-format';

/** Points on the half-normal curve h·exp(−d²/(2σ²)) from d = 0 to 4σ. */
export function halfNormalCurve(height: number, sigma: number, steps = 80): [number, number][] {
  return Array.from({ length: steps + 1 }, (_, i) => {
    const d = (4 * sigma * i) / steps;
    return [d, height * Math.exp(-(d * d) / (2 * sigma * sigma))];
  });
}

/** The fitted detection function g(d) (or λ(d) for count detectors) against distance in metres. */
@Component({
  selector: 'mac-detection-chart',
  imports: [NgxEchartsDirective],
  template: `
    <div
      echarts
      class="chart"
      role="img"
      [attr.aria-label]="description()"
      [options]="options()"
      [initOpts]="init"
    ></div>
  `,
  styles: `
    .chart {
      width: 100%;
      height: 260px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DetectionChart {
  /** g0 (proximity) or λ0 (count) at distance 0. */
  readonly height = input.required<number>();
  readonly sigma = input.required<number>();
  readonly detector = input.required<'proximity' | 'count'>();
  protected readonly init = CHART_INIT;

  private readonly yName = computed(() =>
    this.detector() === 'proximity' ? 'g(d), detection probability' : 'λ(d), expected detections',
  );

  protected readonly description = computed(
    () =>
      `Half-normal detection curve: ${this.yName()} per occasion falls from ` +
      `${formatNumber(this.height(), 3)} at the activity centre with σ = ` +
      `${formatNumber(this.sigma(), 0)} m.`,
  );

  protected readonly options = computed<EChartsOption>(() => ({
    textStyle: { color: CHART_TEXT },
    grid: {
      left: 8,
      right: 24,
      top: 32,
      bottom: 32,
      outerBoundsMode: 'same',
      outerBoundsContain: 'axisLabel',
    },
    tooltip: {
      trigger: 'axis',
      valueFormatter: (v) => (typeof v === 'number' ? formatNumber(v, 3) : String(v)),
    },
    xAxis: {
      type: 'value',
      name: 'distance from activity centre (m)',
      nameLocation: 'middle',
      nameGap: 26,
      axisLabel: { color: CHART_TEXT },
    },
    yAxis: { type: 'value', name: this.yName(), min: 0, axisLabel: { color: CHART_TEXT } },
    series: [
      {
        type: 'line',
        name: this.yName(),
        showSymbol: false,
        data: halfNormalCurve(this.height(), this.sigma()),
        lineStyle: { color: CHART_COLOURS.primary, width: 2 },
        markLine: {
          symbol: 'none',
          silent: true,
          lineStyle: { color: CHART_COLOURS.muted, type: 'dashed' },
          label: { formatter: 'σ', color: CHART_TEXT },
          data: [{ xAxis: this.sigma() }],
        },
      },
    ],
  }));
}
