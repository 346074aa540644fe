/**
 * Wall-clock time in an IANA zone, and back: camera clocks and the deployment forms speak local
 * time; the API stores UTC. Pure functions on Intl, shared by client and server.
 */

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(zone: string): Intl.DateTimeFormat {
  let f = formatters.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone: zone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    formatters.set(zone, f);
  }
  return f;
}

/** Offset of a zone from UTC at an instant, in milliseconds (e.g. +3 h for Africa/Nairobi). */
export function zoneOffsetMs(zone: string, instantMs: number): number {
  const parts = formatter(zone).formatToParts(new Date(instantMs));
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  const asUtc = Date.UTC(
    get('year'),
    get('month') - 1,
    get('day'),
    get('hour'),
    get('minute'),
    get('second'),
  );
  return asUtc - Math.floor(instantMs / 1000) * 1000;
}

/** Parsed wall-clock time. */
interface Wall {
  y: number;
  mo: number;
  d: number;
  h: number;
  mi: number;
  s: number;
  ms: number;
}

function parseWall(text: string): Wall | null {
  const m = /^(\d{4})[:-](\d{2})[:-](\d{2})[ T](\d{2}):(\d{2})(?::(\d{2}))?(?:\.(\d{1,6}))?$/.exec(
    text.trim(),
  );
  if (!m) return null;
  const wall = {
    y: Number(m[1]),
    mo: Number(m[2]),
    d: Number(m[3]),
    h: Number(m[4]),
    mi: Number(m[5]),
    s: Number(m[6] ?? 0),
    ms: m[7] ? Math.round(Number(`0.${m[7]}`) * 1000) : 0,
  };
  if (
    wall.mo < 1 ||
    wall.mo > 12 ||
    wall.d < 1 ||
    wall.d > 31 ||
    wall.h > 23 ||
    wall.mi > 59 ||
    wall.s > 59
  ) {
    return null;
  }
  return wall;
}

/**
 * UTC milliseconds of a wall-clock time in a zone. A local time that a daylight-saving change skips
 * or repeats resolves to one of its candidates; camera clocks never switch, so a deployment whose
 * camera kept standard time should record a fixed-offset zone (e.g. Etc/GMT-1).
 */
export function wallToUtcMs(text: string, zone: string): number | null {
  const w = parseWall(text);
  if (!w) return null;
  const naive = Date.UTC(w.y, w.mo - 1, w.d, w.h, w.mi, w.s, w.ms);
  const first = naive - zoneOffsetMs(zone, naive);
  const second = naive - zoneOffsetMs(zone, first);
  return Math.min(first, second);
}

/** ISO 8601 UTC, with milliseconds only when they are not zero. */
export function isoUtc(ms: number): string {
  const iso = new Date(ms).toISOString();
  return iso.endsWith('.000Z') ? iso.replace('.000Z', 'Z') : iso;
}

/** The wall-clock reading ("2026-07-01T08:30") of a UTC instant in a zone, to the minute. */
export function utcToWall(iso: string, zone: string): string {
  const ms = Date.parse(iso);
  const local = new Date(ms + zoneOffsetMs(zone, ms));
  return local.toISOString().slice(0, 16);
}
