/**
 * Reading what people paste or upload into the calculators: capture histories, trap and capture
 * tables (CSV, semicolon- or tab-separated), and lists of plot counts. Problems come back as
 * sentences with line numbers, so they can be fixed before anything is sent.
 */

/** Parsed rows and the problems found, one sentence each. */
export interface Parsed<T> {
  rows: T[];
  problems: string[];
}

/** One capture history with the animal's label when the line had one. */
export interface HistoryRow {
  id: string | null;
  history: string;
  /** Line of the pasted text or file it came from. */
  line: number;
}

/** A trap (detector) with coordinates in metres. */
export interface TrapRow {
  id: string;
  x: number;
  y: number;
}

/** One detection of an animal at a trap on an occasion (1 = first). */
export interface CaptureRow {
  animal: string;
  occasion: number;
  trap: string;
}

const BINARY = /^[01]+$/;
const ID_HEADER = /^(id|animal|individual|name|code)$/i;

interface Line {
  number: number;
  fields: string[];
}

/** Non-blank, non-comment lines split into fields (comma, semicolon, tab; optional quotes). */
function splitLines(text: string, whitespaceToo = false): Line[] {
  const out: Line[] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.trim();
    if (!line || line.startsWith('#')) return;
    const separator = whitespaceToo
      ? /[\s,;]+/
      : line.includes('\t')
        ? /\t/
        : line.includes(';') && !line.includes(',')
          ? /;/
          : /,/;
    const fields = line
      .split(separator)
      .map((f) => f.trim().replace(/^"(.*)"$/, '$1'))
      .filter((f, j, all) => f !== '' || (j > 0 && j < all.length - 1));
    out.push({ number: i + 1, fields });
  });
  return out;
}

/**
 * Capture histories, one animal per line: `010011`, `0,1,0,0,1,1`, or with the animal's label
 * first (`A12,010011`, `A12 0 1 0 0 1 1`). A first line that is not a history is a header.
 */
export function parseHistoriesText(text: string): Parsed<HistoryRow> {
  const lines = splitLines(text, true);
  const rows: HistoryRow[] = [];
  const problems: string[] = [];
  let dropFirstColumn = false;
  lines.forEach((line, index) => {
    const { fields } = line;
    const rest = fields.slice(1);
    if (!dropFirstColumn && fields.every((f) => BINARY.test(f))) {
      rows.push({ id: null, history: fields.join(''), line: line.number });
    } else if (rest.length > 0 && rest.every((f) => BINARY.test(f))) {
      rows.push({ id: fields[0] ?? null, history: rest.join(''), line: line.number });
    } else if (index === 0) {
      // A header line; an id column named in it means numeric labels are labels, not occasions.
      dropFirstColumn = ID_HEADER.test(fields[0] ?? '');
    } else {
      problems.push(
        `Line ${line.number} ("${fields.join(' ')}") has characters other than 0 and 1 in its history.`,
      );
    }
  });
  checkHistoryShapes(rows, problems);
  return { rows, problems };
}

function checkHistoryShapes(rows: HistoryRow[], problems: string[]): void {
  if (rows.length === 0) {
    if (problems.length === 0) problems.push('Paste at least two capture histories.');
    return;
  }
  const t = rows[0]!.history.length;
  rows.forEach((row) => {
    const where = `Line ${row.line}`;
    const label = row.id ? ` (${row.id})` : '';
    if (row.history.length !== t) {
      problems.push(
        `${where}${label} has ${row.history.length} occasions but the first history has ${t}.`,
      );
    } else if (!row.history.includes('1')) {
      problems.push(`${where}${label} is all zeros: list only animals caught at least once.`);
    }
  });
  if (t === 1) problems.push('A single occasion cannot estimate abundance: give at least two.');
  if (rows.length === 1) problems.push('At least two animals are needed.');
}

/** Column positions of a table: from its header when it has one, else the given order. */
function columns(
  first: Line | undefined,
  names: Record<string, RegExp>,
): { index: Record<string, number>; hasHeader: boolean } {
  const keys = Object.keys(names);
  const fallback = Object.fromEntries(keys.map((k, i) => [k, i]));
  if (!first) return { index: fallback, hasHeader: false };
  const found: Record<string, number> = {};
  first.fields.forEach((field, i) => {
    for (const key of keys) if (found[key] === undefined && names[key]!.test(field)) found[key] = i;
  });
  const hasHeader = keys.every((k) => found[k] !== undefined);
  return { index: hasHeader ? found : fallback, hasHeader };
}

const number = (s: string | undefined): number | null => {
  if (s === undefined || s.trim() === '') return null;
  const v = Number(s);
  return Number.isFinite(v) ? v : null;
};

/** Traps as `id,x,y` in metres (header optional: id/trap/station, x/easting, y/northing). */
export function parseTrapsCsv(text: string): Parsed<TrapRow> {
  const lines = splitLines(text);
  const { index, hasHeader } = columns(lines[0], {
    id: /^(id|trap|station|detector)$/i,
    x: /^(x|easting)$/i,
    y: /^(y|northing)$/i,
  });
  const rows: TrapRow[] = [];
  const problems: string[] = [];
  const seen = new Set<string>();
  for (const line of hasHeader ? lines.slice(1) : lines) {
    const id = line.fields[index['id']!] ?? '';
    const x = number(line.fields[index['x']!]);
    const y = number(line.fields[index['y']!]);
    if (!id) problems.push(`Line ${line.number}: the trap has no id.`);
    else if (x === null || y === null) {
      const axis = x === null ? 'x' : 'y';
      problems.push(`Line ${line.number}: trap ${id} has no usable ${axis} coordinate (metres).`);
    } else if (seen.has(id)) problems.push(`Line ${line.number}: trap id ${id} is used twice.`);
    else {
      seen.add(id);
      rows.push({ id, x, y });
    }
  }
  if (rows.length + problems.length < 2) problems.push('Give at least two traps.');
  return { rows, problems };
}

/** Captures as `animal,occasion,trap` (header optional); traps must be in `trapIds` when given. */
export function parseCapturesCsv(text: string, trapIds?: ReadonlySet<string>): Parsed<CaptureRow> {
  const lines = splitLines(text);
  const { index, hasHeader } = columns(lines[0], {
    animal: /^(animal|individual|id|code)$/i,
    occasion: /^(occasion|occ)$/i,
    trap: /^(trap|station|detector)$/i,
  });
  const rows: CaptureRow[] = [];
  const problems: string[] = [];
  for (const line of hasHeader ? lines.slice(1) : lines) {
    const animal = line.fields[index['animal']!] ?? '';
    const occasion = number(line.fields[index['occasion']!]);
    const trap = line.fields[index['trap']!] ?? '';
    if (!animal || !trap) {
      problems.push(`Line ${line.number}: a capture needs an animal, an occasion and a trap.`);
    } else if (occasion === null || !Number.isInteger(occasion) || occasion < 1) {
      problems.push(`Line ${line.number}: the occasion must be a whole number from 1.`);
    } else if (trapIds && !trapIds.has(trap)) {
      problems.push(`Line ${line.number}: trap ${trap} is not in the trap list.`);
    } else rows.push({ animal, occasion, trap });
  }
  if (rows.length + problems.length === 0) problems.push('Give at least one capture.');
  return { rows, problems };
}

/** Plot counts separated by commas, spaces or new lines: whole numbers, not negative. */
export function parseCounts(text: string): Parsed<number> {
  const rows: number[] = [];
  const problems: string[] = [];
  for (const token of text.split(/[\s,;]+/).filter(Boolean)) {
    const v = Number(token);
    if (!Number.isInteger(v) || v < 0) {
      problems.push(`"${token}" is not a count: counts are whole numbers, 0 or more.`);
    } else rows.push(v);
  }
  if (rows.length + problems.length < 2) problems.push('Give the counts of at least two plots.');
  return { rows, problems };
}
