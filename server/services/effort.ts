const DAY_MS = 86_400_000;

/** The period a deployment counts as effort: start until the end, or until it stopped working. */
export function activeWindow(d: {
  start: string;
  end: string;
  last_working: string | null;
}): [number, number] {
  const start = Date.parse(d.start);
  const end = Math.min(Date.parse(d.end), d.last_working ? Date.parse(d.last_working) : Infinity);
  return [start, Math.max(start, end)];
}

/** Camera-days of one deployment (fractional days). */
export function cameraDays(d: { start: string; end: string; last_working: string | null }): number {
  const [a, b] = activeWindow(d);
  return (b - a) / DAY_MS;
}

/** Days a station had at least one working camera: the union of its deployments' active windows. */
export function stationDays(
  deployments: { start: string; end: string; last_working: string | null }[],
): number {
  const windows = deployments.map(activeWindow).sort((x, y) => x[0] - y[0]);
  let total = 0;
  let current: [number, number] | null = null;
  for (const [a, b] of windows) {
    if (!current || a > current[1]) {
      if (current) total += current[1] - current[0];
      current = [a, b];
    } else {
      current[1] = Math.max(current[1], b);
    }
  }
  if (current) total += current[1] - current[0];
  return total / DAY_MS;
}

/** Rounds days for display and APIs (three decimals, about a minute and a half). */
export function roundDays(days: number): number {
  return Math.round(days * 1000) / 1000;
}
