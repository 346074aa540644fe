// The demo scenario is invented for demonstration and synthetic tests: the conservancy, its
// people, stations and animals do not exist.

/** One demo account per role (demo only; never use these passwords anywhere real). */
export const DEMO_PASSWORD = 'kasiri-demo-2026';

export const DEMO_USERS = [
  { email: 'admin@demo.test', name: 'Ada Admin', isAdmin: true, role: null },
  { email: 'ecologist@demo.test', name: 'Eli Ecologist', isAdmin: false, role: 'ecologist' },
  { email: 'curator@demo.test', name: 'Cato Curator', isAdmin: false, role: 'curator' },
  { email: 'reviewer@demo.test', name: 'Ravi Reviewer', isAdmin: false, role: 'reviewer' },
  { email: 'reviewer2@demo.test', name: 'Rosa Reviewer', isAdmin: false, role: 'reviewer' },
  { email: 'volunteer@demo.test', name: 'Vera Volunteer', isAdmin: false, role: 'volunteer' },
] as const;

export const DEMO_PROJECT = {
  slug: 'kasiri-leopards',
  name: 'Kasiri Hills leopard survey 2026',
  description:
    'Fictional demo: the Kasiri Hills Conservancy runs 20 paired camera stations on a 2 km grid ' +
    'for a 60-day dry-season survey of leopards, identified by their rosettes.',
  targetSpeciesScientific: 'Panthera pardus',
  targetSpeciesCommon: 'Leopard',
  timezone: 'Africa/Nairobi',
  independenceMinutes: 30,
  occasionHours: 24,
  reviewersPerSighting: 2 as const,
  sensitivity: 'high' as const,
  sensitivityReviewDate: '2027-06-30',
  codePrefix: 'KHL',
  boundary: null,
  tileUrl: null,
  gpsToleranceM: 250,
  humanRetentionDays: null,
};

/** The season: 60 days of dry-season sampling (dates are local to the project's time zone). */
export const DEMO_SEASON = { start: '2026-07-01', days: 60 };

/** Grid origin (south-west corner) and spacing: 4 columns × 5 rows of paired stations, 2 km apart. */
const ORIGIN = { lat: -1.2, lon: 36.6 };
const SPACING_M = 2000;
const M_PER_DEG_LAT = 111_320;

/** A demo station: two cameras (A and B) facing each other across a trail. */
export interface DemoStation {
  code: string;
  name: string;
  lat: number;
  lon: number;
  x: number;
  y: number;
}

/** The 20 demo stations, KH01–KH20, row by row from the south-west. */
export function demoStations(): DemoStation[] {
  const stations: DemoStation[] = [];
  const mPerDegLon = M_PER_DEG_LAT * Math.cos((ORIGIN.lat * Math.PI) / 180);
  for (let row = 0; row < 5; row++) {
    for (let col = 0; col < 4; col++) {
      const n = row * 4 + col + 1;
      const x = col * SPACING_M;
      const y = row * SPACING_M;
      stations.push({
        code: `KH${String(n).padStart(2, '0')}`,
        name: `Kasiri ${['ridge', 'gully', 'saddle', 'spring', 'kopje'][row]} ${col + 1}`,
        lat: Number((ORIGIN.lat + y / M_PER_DEG_LAT).toFixed(6)),
        lon: Number((ORIGIN.lon + x / mPerDegLon).toFixed(6)),
        x,
        y,
      });
    }
  }
  return stations;
}

/** A demo deployment: camera A or B of a station for the season (times in UTC). */
export interface DemoDeployment {
  stationCode: string;
  cameraLabel: 'A' | 'B';
  cameraSerial: string;
  start: string;
  end: string;
  lastWorking: string | null;
  clockResetAtStart: boolean;
  featureType: 'trailGame' | 'waterSource' | 'roadDirt';
  notes: string;
}

/**
 * Two cameras per station for the 60-day season (set up from 09:00 local on 1 July, 10 minutes per
 * station; retrieved on 30 August). Two stories for the demo: camera KH07-B's clock was reset to
 * 2000-01-01 by a battery change (fixed from its setup photo), and camera KH12-A stopped on day 41.
 */
export function demoDeployments(): DemoDeployment[] {
  const out: DemoDeployment[] = [];
  demoStations().forEach((station, i) => {
    // 09:00 East Africa Time is 06:00 UTC.
    const start = new Date(Date.UTC(2026, 6, 1, 6, 0) + i * 10 * 60_000)
      .toISOString()
      .replace('.000Z', 'Z');
    const end = new Date(Date.UTC(2026, 7, 30, 7, 0) + i * 10 * 60_000)
      .toISOString()
      .replace('.000Z', 'Z');
    for (const label of ['A', 'B'] as const) {
      const died = station.code === 'KH12' && label === 'A';
      out.push({
        stationCode: station.code,
        cameraLabel: label,
        cameraSerial: `KC${String(i + 1).padStart(2, '0')}${label}-${(4711 + i * 37 + (label === 'B' ? 5 : 0)).toString(16).toUpperCase()}`,
        start,
        end,
        lastWorking: died ? '2026-08-10T14:20:00Z' : null,
        clockResetAtStart: station.code === 'KH07' && label === 'B',
        featureType:
          station.code === 'KH15' ? 'waterSource' : i % 5 === 2 ? 'roadDirt' : 'trailGame',
        notes: died ? 'Found with a flat battery on retrieval; last photo 10 Aug.' : '',
      });
    }
  });
  return out;
}

/** The study area: the grid's extent with a 1.5 km margin, as a GeoJSON polygon (lon, lat). */
export function demoBoundary(): { type: 'Polygon'; coordinates: [number, number][][] } {
  const stations = demoStations();
  const marginLat = 1500 / M_PER_DEG_LAT;
  const marginLon = 1500 / (M_PER_DEG_LAT * Math.cos((ORIGIN.lat * Math.PI) / 180));
  const lats = stations.map((s) => s.lat);
  const lons = stations.map((s) => s.lon);
  const [s, n] = [Math.min(...lats) - marginLat, Math.max(...lats) + marginLat];
  const [w, e] = [Math.min(...lons) - marginLon, Math.max(...lons) + marginLon];
  const r = (x: number) => Number(x.toFixed(5));
  return {
    type: 'Polygon',
    coordinates: [
      [
        [r(w), r(s)],
        [r(e), r(s)],
        [r(e), r(n)],
        [r(w), r(n)],
        [r(w), r(s)],
      ],
    ],
  };
}
