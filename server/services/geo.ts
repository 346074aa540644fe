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
