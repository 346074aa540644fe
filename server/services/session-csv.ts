/** CSV downloads of a session's inputs: effort grid, capture histories, detections, stations. */
import type { SessionInputs, SessionTable } from '../../shared/analyses';

/** A CSV field: quoted when needed; a leading formula character is defused for spreadsheets. */
export function csvField(value: string | number): string {
  let text = String(value);
  if (typeof value === 'string' && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function csv(rows: (string | number)[][]): string {
  return rows.map((r) => r.map(csvField).join(',')).join('\r\n') + '\r\n';
}

const occasionHeader = (inputs: SessionInputs) =>
  inputs.occasions.map((_, s) => `occasion_${s + 1}`);

/** Station × occasion, days with at least one working camera (0 = not working). */
function effortCsv(inputs: SessionInputs): string {
  return csv([
    ['station', ...occasionHeader(inputs)],
    ...inputs.stations.map((st, k) => [st.code, ...(inputs.effort[k] ?? []).map((v) => v)]),
  ]);
}

/** One row per individual: its code and its 0/1 history (the calculators read this as pasted). */
function historiesCsv(inputs: SessionInputs): string {
  return csv([
    ['individual', 'history'],
    ...inputs.individuals.map((ind, i) => [ind.code, inputs.histories[i] ?? '']),
  ]);
}

/** The detection array in long form: individual, occasion (1 = first), station, detections. */
function detectionsCsv(inputs: SessionInputs): string {
  return csv([
    ['individual', 'occasion', 'station', 'detections'],
    ...inputs.detections.map(([i, s, k, n]) => [
      inputs.individuals[i]?.code ?? String(i),
      s + 1,
      inputs.stations[k]?.code ?? String(k),
      n,
    ]),
  ]);
}

/** Stations with metres on the session's local plane (what SECR used) and exact coordinates. */
function stationsCsv(inputs: SessionInputs): string {
  return csv([
    ['station', 'x_m', 'y_m', 'lat', 'lon'],
    ...inputs.stations.map((s) => [s.code, s.x, s.y, s.lat, s.lon]),
  ]);
}

/** The CSV text of one table of a session. */
export function sessionCsv(inputs: SessionInputs, table: SessionTable): string {
  switch (table) {
    case 'effort':
      return effortCsv(inputs);
    case 'histories':
      return historiesCsv(inputs);
    case 'detections':
      return detectionsCsv(inputs);
    case 'stations':
      return stationsCsv(inputs);
  }
}

/** A download file name: `<prefix>-<table>.csv` with only safe characters. */
export function csvFileName(prefix: string, table: SessionTable): string {
  return `${prefix.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 80)}-${table}.csv`;
}
