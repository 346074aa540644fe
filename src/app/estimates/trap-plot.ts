import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { EChartsOption } from 'echarts';
import { NgxEchartsDirective } from 'ngx-echarts';
import { CHART_COLOURS, CHART_INIT, CHART_TEXT } from '../ui/charts';
import type { CaptureRow, TrapRow } from './estimate-input';

/** Per trap: animals detected there; per animal: its traps in order of first detection. */
export function detectionLayout(traps: readonly TrapRow[], captures: readonly CaptureRow[]) {
  const where = new Map(traps.map((t) => [t.id, t]));
  const animalsAt = new Map<string, Set<string>>();
  const pathOf = new Map<string, string[]>();
  for (const c of [...captures].sort((a, b) => a.occasion - b.occasion)) {
    if (!where.has(c.trap)) continue;
    animalsAt.set(c.trap, (animalsAt.get(c.trap) ?? new Set()).add(c.animal));
    const path = pathOf.get(c.animal) ?? [];
    if (!path.includes(c.trap)) path.push(c.trap);
    pathOf.set(c.animal, path);
  }
  const links: (number[] | '-')[] = [];
  for (const path of pathOf.values()) {
    if (path.length < 2) continue;
    for (const id of path) links.push([where.get(id)!.x, where.get(id)!.y]);
    links.push('-');
  }
  return { animalsAt, links, spatialRecaptures: [...pathOf.values()].filter((p) => p.length > 1) };
}

/** Traps on a square plot (metres); traps with detections stand out, linked per animal. */
@Component({
  selector: 'mac-trap-plot',
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
      max-width: 440px;
      aspect-ratio: 1;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TrapPlot {
  readonly traps = input.required<readonly TrapRow[]>();
  readonly captures = input.required<readonly CaptureRow[]>();
  protected readonly init = CHART_INIT;
  private readonly layout = computed(() => detectionLayout(this.traps(), this.captures()));

  protected readonly description = computed(() => {
    const l = this.layout();
    return (
      `Plot of ${this.traps().length} traps; ${l.animalsAt.size} had detections, and ` +
      `${l.spatialRecaptures.length} animals were detected at more than one trap.`
    );
  });

  protected readonly options = computed<EChartsOption>(() => {
    const traps = this.traps();
    const { animalsAt, links } = this.layout();
    const xs = traps.map((t) => t.x);
    const ys = traps.map((t) => t.y);
    // Equal spans on both axes keep distances true on the square plot.
    const span = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys), 1);
    const pad = span * 0.08;
    const cx = (Math.max(...xs) + Math.min(...xs)) / 2;
    const cy = (Math.max(...ys) + Math.min(...ys)) / 2;
    const half = span / 2 + pad;
    const axis = (c: number) => ({
      type: 'value' as const,
      min: Math.floor(c - half),
      max: Math.ceil(c + half),
      axisLabel: { color: CHART_TEXT },
      splitLine: { show: false },
    });
    return {
      textStyle: { color: CHART_TEXT },
      grid: {
        left: 8,
        right: 16,
        top: 40,
        bottom: 8,
        outerBoundsMode: 'same',
        outerBoundsContain: 'axisLabel',
      },
      legend: { top: 0, textStyle: { color: CHART_TEXT } },
      tooltip: { trigger: 'item' },
      xAxis: { ...axis(cx), name: 'x (m)', nameLocation: 'middle', nameGap: 24 },
      yAxis: { ...axis(cy), name: 'y (m)', nameLocation: 'middle', nameGap: 36 },
      series: [
        {
          type: 'line',
          name: 'same animal',
          data: links,
          showSymbol: false,
          connectNulls: false,
          lineStyle: { color: CHART_COLOURS.accent, width: 1, opacity: 0.6 },
          tooltip: { show: false },
        },
        {
          type: 'scatter',
          name: 'no detection',
          data: traps.filter((t) => !animalsAt.has(t.id)).map((t) => [t.x, t.y, t.id]),
          symbol: 'emptyCircle',
          symbolSize: 7,
          itemStyle: { color: CHART_COLOURS.muted },
          tooltip: { formatter: (p: { value: unknown }) => `trap ${(p.value as unknown[])[2]}` },
        },
        {
          type: 'scatter',
          name: 'animals detected',
          data: traps
            .filter((t) => animalsAt.has(t.id))
            .map((t) => [t.x, t.y, t.id, animalsAt.get(t.id)!.size]),
          symbolSize: (v: unknown[]) => 8 + 3 * Math.sqrt(Number(v[3])),
          itemStyle: { color: CHART_COLOURS.primary },
          tooltip: {
            formatter: (p: { value: unknown }) => {
              const v = p.value as unknown[];
              return `trap ${v[2]}: ${v[3]} animal${v[3] === 1 ? '' : 's'}`;
            },
          },
        },
      ],
    };
  });
}
