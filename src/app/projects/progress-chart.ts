import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';

/** Per-station counts the Overview draws. */
export interface StationProgress {
  stationCode: string;
  events: number;
  sorted: number;
  sightingsOpen: number;
  sightingsProposed: number;
  sightingsConfirmed: number;
}

/** Sorting and identification progress per station, as stacked bars. */
@Component({
  selector: 'mac-progress-chart',
  imports: [NgxEchartsDirective],
  template: `<div
    echarts
    class="chart"
    role="img"
    [attr.aria-label]="description()"
    [options]="options()"
    [initOpts]="init"
  ></div>`,
  styles: `
    .chart {
      width: 100%;
      height: 280px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProgressChart {
  readonly stations = input.required<StationProgress[]>();
  protected readonly init = CHART_INIT;
  protected readonly description = computed(
    () =>
      'Stacked bars per station: ' +
      this.stations()
        .map(
          (s) =>
            `${s.stationCode} ${s.sorted} of ${s.events} events sorted, ${s.sightingsConfirmed} sightings confirmed`,
        )
        .join('; '),
  );
  protected readonly options = computed<EChartsOption>(() => {
    const s = this.stations();
    const bar = (name: string, data: number[], color: string, stack: string) => ({
      name,
      type: 'bar' as const,
      stack,
      data,
      itemStyle: { color },
    });
    return {
      textStyle: { color: CHART_TEXT },
      tooltip: { trigger: 'axis' },
      legend: { top: 0, textStyle: { color: CHART_TEXT } },
      grid: {
        left: 8,
        right: 8,
        top: 36,
        bottom: 8,
        outerBoundsMode: 'same',
        outerBoundsContain: 'axisLabel',
      },
      xAxis: {
        type: 'category',
        data: s.map((x) => x.stationCode),
        axisLabel: { color: CHART_TEXT, rotate: 45 },
      },
      yAxis: { type: 'value', minInterval: 1, axisLabel: { color: CHART_TEXT } },
      series: [
        bar(
          'events sorted',
          s.map((x) => x.sorted),
          CHART_COLOURS.primary,
          'events',
        ),
        bar(
          'events to sort',
          s.map((x) => x.events - x.sorted),
          CHART_COLOURS.muted,
          'events',
        ),
        bar(
          'sightings confirmed',
          s.map((x) => x.sightingsConfirmed),
          CHART_COLOURS.accent,
          'sightings',
        ),
        bar(
          'sightings proposed',
          s.map((x) => x.sightingsProposed),
          '#d9a064',
          'sightings',
        ),
        bar(
          'sightings open',
          s.map((x) => x.sightingsOpen),
          '#eebd8e',
          'sightings',
        ),
      ],
    };
  });
}
