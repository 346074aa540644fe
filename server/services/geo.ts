/** Great-circle distance in metres (haversine; plenty for a few hundred metres to kilometres). */
export function distanceMetres(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const r = 6_371_008.8;
  const toRad = Math.PI / 180;
  const dLat = (lat2 - lat1) * toRad;
  const dLon = (lon2 - lon1) * toRad;
  const a =
    Math.sin(dLat / 2) ** 2 +
    Math.cos(lat1 * toRad) * Math.cos(lat2 * toRad) * Math.sin(dLon / 2) ** 2;
  return 2 * r * Math.asin(Math.min(1, Math.sqrt(a)));
}

/**
 * Snaps a coordinate to a grid of `precision` degrees (GBIF's generalisation guidance: round, never
 * add random noise). The result is printed with no more decimals than the precision allows.
 */
export function snapToGrid(value: number, precision: number): number {
  const decimals = Math.max(0, Math.round(-Math.log10(precision)));
  const snapped = Math.round(value / precision) * precision;
  return Number(snapped.toFixed(decimals));
}

/** Coordinates as a role may see them: exact, generalised to the grid, or withheld (null). */
export function generalise(
  lat: number,
  lon: number,
  precision: number | null | undefined,
): { lat: number | null; lon: number | null; precision: number | null; withheld: boolean } {
  if (precision === undefined) return { lat, lon, precision: null, withheld: false };
  if (precision === null) return { lat: null, lon: null, precision: null, withheld: true };
  return {
    lat: snapToGrid(lat, precision),
    lon: snapToGrid(lon, precision),
    precision,
    withheld: false,
  };
}

/** Station positions in metres on a local plane (equirectangular about the stations' mean). */
export function localPlane<T extends { id: string; lat: number; lon: number; code: string }>(
  stations: T[],
): Map<string, { x: number; y: number; code: string }> {
  const out = new Map<string, { x: number; y: number; code: string }>();
  if (stations.length === 0) return out;
  const lat0 = stations.reduce((a, s) => a + s.lat, 0) / stations.length;
  const lon0 = stations.reduce((a, s) => a + s.lon, 0) / stations.length;
  const mPerDegLat = 111_320;
  const mPerDegLon = 111_320 * Math.cos((lat0 * Math.PI) / 180);
  for (const s of stations) {
    out.set(s.id, { x: (s.lon - lon0) * mPerDegLon, y: (s.lat - lat0) * mPerDegLat, code: s.code });
  }
  return out;
}
