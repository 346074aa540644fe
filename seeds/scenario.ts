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
