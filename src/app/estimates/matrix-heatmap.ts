import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_INIT, CHART_TEXT } from '../ui/charts';
import { heatmapCells, type HeatmapPiece } from './heatmap-data';

/** Height of one row of cells, in pixels. */
const ROW_PX = 16;

/** A matrix (stations or individuals × occasions) as a heatmap with a legend of what colours mean. */
@Component({
  selector: 'mac-matrix-heatmap',
  imports: [NgxEchartsDirective],
  template: `
    <div
      echarts
      class="chart"
      role="img"
      [attr.aria-label]="ariaLabel()"
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
export class MatrixHeatmap {
  readonly rows = input.required<readonly string[]>();
  /** Titles of the columns (occasions), shown in tooltips; the axis shows their numbers. */
  readonly columns = input.required<readonly string[]>();
  readonly values = input.required<readonly (readonly number[])[]>();
  readonly pieces = input.required<readonly HeatmapPiece[]>();
  readonly unit = input('');
  readonly ariaLabel = input('Heatmap');
  protected readonly init = CHART_INIT;
  protected readonly height = computed(() => 96 + ROW_PX * Math.max(this.rows().length, 2));

  protected readonly options = computed<EChartsOption>(() => {
    const rows = this.rows();
    const columns = this.columns();
    const unit = this.unit();
    return {
      textStyle: { color: CHART_TEXT },
      animation: false,
      grid: {
        left: 8,
        right: 16,
        top: 8,
        bottom: 56,
        outerBoundsMode: 'same',
        outerBoundsContain: 'axisLabel',
      },
      tooltip: {
        formatter: (item: unknown) => {
          const value = (item as { value?: [number, number, number] }).value;
          if (!value) return '';
          const [x, y, v] = value;
          return `${rows[y] ?? ''} · occasion ${columns[x] ?? x + 1}<br>${v}${unit ? ` ${unit}` : ''}`;
        },
      },
      xAxis: {
        type: 'category',
        data: columns.map((_, s) => String(s + 1)),
        name: 'occasion',
        nameLocation: 'middle',
        nameGap: 22,
        splitArea: { show: false },
        axisLabel: { color: CHART_TEXT },
      },
      yAxis: {
        type: 'category',
        inverse: true,
        data: [...rows],
        axisLabel: { color: CHART_TEXT, fontSize: 10 },
      },
      visualMap: {
        type: 'piecewise',
        orient: 'horizontal',
        left: 'center',
        bottom: 0,
        dimension: 2,
        pieces: this.pieces().map((p) => ({ ...p })),
        textStyle: { color: CHART_TEXT },
      },
      series: [
        {
          type: 'heatmap',
          data: heatmapCells(this.values()),
          itemStyle: { borderColor: 'rgba(255,255,255,0.6)', borderWidth: 0.5 },
          emphasis: { disabled: true },
        },
      ],
    };
  });
}
