import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';

/** Capture frequencies: how many animals were caught exactly k times, k = 1..t. */
@Component({
  selector: 'mac-frequency-chart',
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
      height: 240px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrequencyChart {
  /** frequencies[k − 1] = animals caught exactly k times. */
  readonly frequencies = input.required<readonly number[]>();
  protected readonly init = CHART_INIT;

  protected readonly description = computed(
    () =>
      'Bar chart of capture frequencies: ' +
      this.frequencies()
        .map((f, i) => `${f} caught ${i + 1} time${i === 0 ? '' : 's'}`)
        .join(', '),
  );

  protected readonly options = computed<EChartsOption>(() => ({
    textStyle: { color: CHART_TEXT },
    grid: {
      left: 8,
      right: 16,
      top: 24,
      bottom: 28,
      outerBoundsMode: 'same',
      outerBoundsContain: 'axisLabel',
    },
    tooltip: { trigger: 'axis' },
    xAxis: {
      type: 'category',
      name: 'times caught',
      nameLocation: 'middle',
      nameGap: 24,
      data: this.frequencies().map((_, i) => `f${i + 1}`),
      axisLabel: { color: CHART_TEXT },
    },
    yAxis: {
      type: 'value',
      name: 'animals',
      minInterval: 1,
      axisLabel: { color: CHART_TEXT },
    },
    series: [
      {
        type: 'bar',
        name: 'animals',
        data: [...this.frequencies()],
        itemStyle: { color: CHART_COLOURS.primary },
      },
    ],
  }));
}
