import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type {
  CustomSeriesRenderItemAPI,
  CustomSeriesRenderItemParams,
  CustomSeriesRenderItemReturn,
  EChartsOption,
} from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import type { Interval } from '../../../shared/estimate';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';
import { formatInterval, formatNumber } from './estimate-format';

/** One model's point estimate and interval, as the chart draws it. */
export interface ModelPoint {
  model: string;
  N: number;
  ci: Interval | null;
}

/** Draws the whisker of one interval: a line from lo to hi with end caps (open end if unbounded). */
function whisker(
  _params: CustomSeriesRenderItemParams,
  api: CustomSeriesRenderItemAPI,
): CustomSeriesRenderItemReturn {
  const row = Number(api.value(2));
  const lo = api.coord([Number(api.value(0)), row]);
  const hi = api.coord([Number(api.value(1)), row]);
  const open = Number(api.value(3)) === 1;
  const style = { stroke: CHART_COLOURS.primary, lineWidth: 2 };
  const cap = (x: number, y: number) => ({
    type: 'line' as const,
    shape: { x1: x, y1: y - 6, x2: x, y2: y + 6 },
    style,
  });
  const children = [
    { type: 'line' as const, shape: { x1: lo[0], y1: lo[1], x2: hi[0], y2: hi[1] }, style },
    cap(lo[0]!, lo[1]!),
  ];
  if (!open) children.push(cap(hi[0]!, hi[1]!));
  return { type: 'group', children };
}

/** N̂ with its 95 % interval per model, with a line at S (estimates below it are impossible). */
@Component({
  selector: 'mac-model-chart',
  imports: [NgxEchartsDirective],
  template: `
    <div
      echarts
      class="chart"
      role="img"
      [attr.aria-label]="description()"
      [options]="options()"
      [initOpts]="init"
      [style.height.px]="height()"
    ></div>
  `,
  styles: `
    .chart {
      width: 100%;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ModelChart {
  readonly points = input.required<readonly ModelPoint[]>();
  /** Animals caught (the least N can be). */
  readonly caught = input.required<number>();
  protected readonly init = CHART_INIT;
  protected readonly height = computed(() => 60 + 36 * this.points().length);

  protected readonly description = computed(
    () =>
      `Chart of estimated abundance with 95 % intervals for ${this.points().length} models; ` +
      `${this.caught()} animals were caught.`,
  );

  protected readonly options = computed<EChartsOption>(() => {
    const points = this.points();
    const finite = points.flatMap((p) => [p.N, p.ci?.[1] ?? p.N]).filter(Number.isFinite);
    // Unbounded or very long intervals are cut at three times the largest estimate.
    const cut = 3 * Math.max(...points.map((p) => p.N), this.caught());
    const xMax = Math.min(Math.max(...finite, this.caught()), cut);
    return {
      textStyle: { color: CHART_TEXT },
      grid: {
        left: 8,
        right: 24,
        top: 24,
        bottom: 32,
        outerBoundsMode: 'same',
        outerBoundsContain: 'axisLabel',
      },
      tooltip: { trigger: 'item' },
      xAxis: {
        type: 'value',
        name: 'N̂',
        min: (v: { min: number }) => Math.floor(Math.min(v.min, this.caught()) * 0.95),
        max: Math.ceil(xMax * 1.02),
        axisLabel: { color: CHART_TEXT },
      },
      yAxis: {
        type: 'category',
        inverse: true,
        data: points.map((p) => p.model),
        axisLabel: { color: CHART_TEXT },
      },
      series: [
        {
          type: 'custom',
          name: '95 % interval',
          renderItem: whisker,
          encode: { x: [0, 1], y: 2 },
          data: points.map((p, i) => {
            const hi = p.ci?.[1];
            const open = hi === null || hi === undefined || hi > cut;
            return [p.ci?.[0] ?? p.N, open ? cut : hi, i, open ? 1 : 0];
          }),
          tooltip: { show: false },
          z: 1,
        },
        {
          type: 'scatter',
          name: 'N̂',
          symbolSize: 10,
          itemStyle: { color: CHART_COLOURS.accent },
          data: points.map((p, i) => [p.N, i]),
          tooltip: {
            formatter: (item: { dataIndex: number }) => {
              const p = points[item.dataIndex]!;
              return `${p.model}: N̂ = ${formatNumber(p.N)}<br>95 % CI ${formatInterval(p.ci)}`;
            },
          },
          markLine: {
            symbol: 'none',
            silent: true,
            lineStyle: { color: CHART_COLOURS.muted, type: 'dashed' },
            label: { formatter: `S = ${this.caught()}`, color: CHART_TEXT },
            data: [{ xAxis: this.caught() }],
          },
          z: 2,
        },
      ],
    };
  });
}
