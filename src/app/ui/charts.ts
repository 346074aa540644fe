/**
 * The ECharts pieces Maculo draws with, registered once: bar, scatter, line, heatmap and custom
 * (error bars) series, grid, tooltip, legend and visual map (heatmap colour scales), and the SVG
 * renderer (crisp, and it runs in jsdom).
 */
import { BarChart, CustomChart, HeatmapChart, LineChart, ScatterChart } from 'echarts/charts';
import {
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
  VisualMapComponent,
} from 'echarts/components';
import * as echarts from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';
import { provideEchartsCore } from 'ngx-echarts';
import type { Provider } from '@angular/core';

echarts.use([
  BarChart,
  CustomChart,
  HeatmapChart,
  LineChart,
  ScatterChart,
  GridComponent,
  LegendComponent,
  MarkLineComponent,
  TooltipComponent,
  VisualMapComponent,
  SVGRenderer,
]);

/** Provider for routes that draw charts: ngx-echarts with the pieces registered above. */
export function provideCharts(): Provider {
  return provideEchartsCore({ echarts });
}

/** Renderer options every chart uses. */
export const CHART_INIT = { renderer: 'svg' } as const;

/** Mid-tone colours of the app's palettes (primary 50, tertiary 50, neutral 50, error 50): they read on light and dark surfaces alike. */
export const CHART_COLOURS = {
  primary: '#048398',
  accent: '#9f6c33',
  muted: '#72787a',
  alert: '#cd4b44',
} as const;

/** Text colour for axes and labels that works on both themes. */
export const CHART_TEXT = '#8c9293';
