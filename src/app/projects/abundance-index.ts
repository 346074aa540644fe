import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';

/** The relative abundance index as the server reports it. */
export interface AbundanceIndex {
  label: string;
  effortDays: number;
  cameraDays: number;
  species: {
    species: string;
    events: number;
    overall: number | null;
    stations: {
      stationCode: string;
      events: number;
      effortDays: number;
      per100Days: number | null;
    }[];
  }[];
}

/** Independent events per 100 station-days per species: a chart, and a table by station. */
@Component({
  selector: 'mac-abundance-index',
  imports: [DecimalPipe, NgxEchartsDirective],
  template: `
    <p class="muted">
      {{ index().label }} Effort: {{ index().effortDays | number: '1.0-1' }} station-days ({{
        index().cameraDays | number: '1.0-1'
      }}
      camera-days).
    </p>
    @if (index().species.length) {
      <div
        echarts
        class="chart"
        role="img"
        [attr.aria-label]="description()"
        [options]="options()"
        [initOpts]="init"
      ></div>
      @if (stationCodes().length) {
        <div class="table-wrap">
          <table class="table" data-testid="abundance-table">
            <thead>
              <tr>
                <th>Species</th>
                <th>All</th>
                @for (c of stationCodes(); track c) {
                  <th>{{ c }}</th>
                }
              </tr>
            </thead>
            <tbody>
              @for (s of index().species; track s.species) {
                <tr>
                  <td>
                    <em>{{ s.species }}</em> ({{ s.events }})
                  </td>
                  <td>{{ s.overall | number: '1.0-2' }}</td>
                  @for (r of s.stations; track r.stationCode) {
                    <td [attr.title]="r.events + ' events in ' + r.effortDays + ' days'">
                      {{ r.per100Days === null ? '—' : (r.per100Days | number: '1.0-1') }}
                    </td>
                  }
                </tr>
              }
            </tbody>
          </table>
        </div>
      }
    } @else {
      <p class="muted">No animal events sorted yet.</p>
    }
  `,
  styles: `
    .chart {
      width: 100%;
      height: 240px;
    }
    .table-wrap {
      overflow-x: auto;
    }
    .table {
      border-collapse: collapse;
      font: var(--mat-sys-body-small);
    }
    .table th,
    .table td {
      padding: 4px 6px;
      border-top: 1px solid var(--mat-sys-outline-variant);
      text-align: right;
    }
    .table td:first-child,
    .table th:first-child {
      text-align: left;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AbundanceIndexView {
  readonly index = input.required<AbundanceIndex>();
  protected readonly init = CHART_INIT;
  protected readonly stationCodes = computed(
    () => this.index().species[0]?.stations.map((s) => s.stationCode) ?? [],
  );
  protected readonly description = computed(
    () =>
      'Bar chart of events per 100 station-days: ' +
      this.index()
        .species.map((s) => `${s.species} ${s.overall?.toFixed(2) ?? 'none'}`)
        .join(', '),
  );
  protected readonly options = computed<EChartsOption>(() => {
    const list = [...this.index().species].sort((a, b) => (a.overall ?? 0) - (b.overall ?? 0));
    return {
      textStyle: { color: CHART_TEXT },
      tooltip: { trigger: 'axis' },
      grid: {
        left: 8,
        right: 24,
        top: 8,
        bottom: 8,
        outerBoundsMode: 'same',
        outerBoundsContain: 'axisLabel',
      },
      xAxis: {
        type: 'value',
        name: 'events per 100 station-days',
        nameLocation: 'middle',
        nameGap: 24,
        axisLabel: { color: CHART_TEXT },
      },
      yAxis: {
        type: 'category',
        data: list.map((s) => s.species),
        axisLabel: { color: CHART_TEXT, fontStyle: 'italic' },
      },
      series: [
        {
          type: 'bar',
          data: list.map((s) => Number((s.overall ?? 0).toFixed(3))),
          itemStyle: { color: CHART_COLOURS.primary },
        },
      ],
    };
  });
}
