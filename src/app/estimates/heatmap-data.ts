/**
 * Shaping the session matrices for heatmaps: cells as [column, row, value], and the colour pieces
 * that say what a value means (an effort of 0 is "not working", never "not seen").
 */
import { CHART_COLOURS } from '../ui/charts';

/** One colour band of a heatmap legend. */
export interface HeatmapPiece {
  label: string;
  color: string;
  /** Exact value, or a half-open range [gte, lt). */
  value?: number;
  gt?: number;
  gte?: number;
  lt?: number;
}

/** Light grey for cells that mean "no data here" (a camera not working). */
export const OFF_COLOUR = '#d9dedd';

/** Cells of a row-major matrix as [column, row, value]; row 0 is drawn on top. */
export function heatmapCells(values: readonly (readonly number[])[]): [number, number, number][] {
  const cells: [number, number, number][] = [];
  values.forEach((row, y) => row.forEach((v, x) => cells.push([x, y, v])));
  return cells;
}

/** Effort bands: not working, part of the occasion, the whole occasion (`fullDays` long). */
export function effortPieces(fullDays: number): HeatmapPiece[] {
  return [
    { value: 0, label: 'not working', color: OFF_COLOUR },
    { gt: 0, lt: fullDays, label: 'part of the occasion', color: '#8cd1e3' },
    { gte: fullDays, label: `whole occasion (${fullDays} d)`, color: CHART_COLOURS.primary },
  ];
}

/** Capture-history bands: not detected, detected. */
export function historyPieces(): HeatmapPiece[] {
  return [
    { value: 0, label: 'not detected', color: '#eef1f0' },
    { value: 1, label: 'detected', color: CHART_COLOURS.accent },
  ];
}

/** Occasion length in days (a pooled occasion of 48 h is 2 days). */
export function occasionDays(occasionHours: number): number {
  return Math.round((occasionHours / 24) * 1000) / 1000;
}

/** A short column title for an occasion: its number and its first day (YYYY-MM-DD, local). */
export function occasionTitles(
  occasions: readonly { start: string }[],
  zoneDay: (iso: string) => string,
): string[] {
  return occasions.map((o, s) => `${s + 1} · ${zoneDay(o.start)}`);
}
