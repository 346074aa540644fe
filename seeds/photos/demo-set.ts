/**
 * A synthetic season for the fictional Kasiri Hills Conservancy survey: 20 paired stations on a
 * 2 km grid, 60 days, bursts of photos of blanks, people, vehicles, other species and a handful of
 * leopards (both cameras of a pair fire together, showing opposite flanks). All data are synthetic.
 */
import { exifTimeOfWallClock } from './exif';
import { Rng } from './random';
import type { Flank, OtherSpecies, PhotoSpec, Subject } from './types';
import { randomVariation } from './variation';

/** One planned photo: its spec, a file name and the true local time (camera clocks may be off). */
export interface DemoPhoto {
  readonly file: string;
  readonly spec: PhotoSpec;
  /** True local time "YYYY-MM-DDTHH:MM:SS" (the camera's EXIF time minus its clock error). */
  readonly trueLocalTime: string;
}

/** Options of the demo season. */
export interface DemoOptions {
  readonly count: number;
  readonly width: number;
  readonly height: number;
  readonly seed?: number;
  readonly quality?: number;
}

/** A station of the demo grid. */
export interface DemoStation {
  readonly code: string;
  readonly lat: number;
  readonly lon: number;
}

// Fictional survey area; the origin is an arbitrary point chosen for the demo.
const ORIGIN = { lat: -2.5, lon: 37.2 };
const SEASON_START = Date.UTC(2025, 2, 1);
const SPECIES: readonly OtherSpecies[] = [
  'bushbuck',
  'porcupine',
  'honeyBadger',
  'baboon',
  'genet',
];
const LEOPARDS = ['P01', 'P02', 'P03', 'P04', 'P05', 'P06', 'P07', 'P08'];

/** The 20 stations: 5 columns by 4 rows, 2 km apart. */
export function demoStations(): DemoStation[] {
  const stations: DemoStation[] = [];
  const dLat = 2 / 111.32;
  const dLon = 2 / (111.32 * Math.cos((ORIGIN.lat * Math.PI) / 180));
  for (let row = 0; row < 4; row++) {
    for (let col = 0; col < 5; col++) {
      const n = row * 5 + col + 1;
      stations.push({
        code: `KH${String(n).padStart(2, '0')}`,
        lat: ORIGIN.lat - row * dLat,
        lon: ORIGIN.lon + col * dLon,
      });
    }
  }
  return stations;
}

/** Clock error of a camera in seconds: most are right, one was reset, one runs an hour late. */
function clockError(code: string, camera: string): number {
  if (code === 'KH07' && camera === 'B') return (Date.UTC(2000, 0, 1) - SEASON_START) / 1000;
  if (code === 'KH13' && camera === 'A') return 67 * 60 + 12;
  return 0;
}

function drawSubject(rng: Rng): Subject {
  const r = rng.next();
  if (r < 0.4) return { kind: 'blank' };
  if (r < 0.58)
    return {
      kind: 'target',
      individual: rng.pick(LEOPARDS),
      flank: rng.pick<Flank>(['left', 'right']),
    };
  if (r < 0.8) return { kind: 'animal', species: rng.pick(SPECIES) };
  if (r < 0.92) return { kind: 'human' };
  if (r < 0.97) return { kind: 'vehicle' };
  return { kind: 'setup', lines: [] };
}

function iso(ms: number): string {
  return new Date(ms).toISOString().slice(0, 19);
}

/** Plans `count` photos of the demo season (deterministic for the options). */
export function demoPhotos(opts: DemoOptions): DemoPhoto[] {
  const rng = new Rng(opts.seed ?? 2025);
  const stations = demoStations();
  const photos: DemoPhoto[] = [];
  while (photos.length < opts.count) {
    const st = rng.pick(stations);
    const camera = rng.pick(['A', 'B']);
    let subject = drawSubject(rng);
    let trueStart = SEASON_START + rng.int(0, 60 * 86400 - 1) * 1000;
    if (subject.kind === 'setup') {
      // Set-up boards are photographed when the camera is deployed: the first days, by daylight.
      trueStart = SEASON_START + (rng.int(0, 1) * 86400 + rng.int(8 * 3600, 16 * 3600)) * 1000;
      const t = iso(trueStart).replace('T', ' ');
      subject = { kind: 'setup', lines: [`${st.code} ${camera}`, t.slice(0, 10), t.slice(11)] };
    }
    const hour = new Date(trueStart).getUTCHours();
    const lighting = hour >= 18 || hour < 6 ? 'infrared' : 'day';
    const burst =
      subject.kind === 'blank' || subject.kind === 'setup' ? rng.int(1, 2) : rng.int(2, 3);
    const base = randomVariation(rng.int(0, 2 ** 30), 0.5, subject.kind);
    const shots: { cam: string; subject: Subject; mirrorDir: number }[] = [
      { cam: camera, subject, mirrorDir: 1 },
    ];
    if (subject.kind === 'target' && rng.chance(0.7)) {
      // The paired camera faces this one across the trail: it sees the other flank.
      const other: Flank = subject.flank === 'left' ? 'right' : 'left';
      shots.push({
        cam: camera === 'A' ? 'B' : 'A',
        subject: { ...subject, flank: other },
        mirrorDir: -1,
      });
    }
    for (const shot of shots) {
      const heading =
        shot.subject.kind === 'target' ? (shot.subject.flank === 'right' ? 1 : -1) : 1;
      for (let k = 0; k < burst && photos.length < opts.count; k++) {
        const key = `${st.code}-${shot.cam}`;
        const trueMs = trueStart + k * 1000;
        const camMs = trueMs + clockError(st.code, shot.cam) * 1000;
        const pos = (base.position ?? 0) * shot.mirrorDir + heading * (k - (burst - 1) / 2) * 0.35;
        photos.push({
          file: key,
          trueLocalTime: iso(trueMs),
          spec: {
            width: opts.width,
            height: opts.height,
            seed: rng.int(0, 2 ** 30),
            station: st.code,
            camera: shot.cam,
            lighting,
            subject: shot.subject,
            variation: { ...base, position: pos, gait: ((base.gait ?? 0) + k * 0.3) % 1 },
            quality: opts.quality,
            exif: {
              dateTimeOriginal: exifTimeOfWallClock(new Date(camMs)),
              subSecTimeOriginal: String(rng.int(0, 99)).padStart(2, '0'),
              make: 'Synthetic Trailcam',
              model: 'ST-1',
              serial: `ST1-${st.code.slice(2)}${shot.cam === 'A' ? '1' : '2'}`,
              gps: { lat: st.lat + rng.normal(0.00005), lon: st.lon + rng.normal(0.00005) },
            },
          },
        });
      }
    }
  }
  return numberFiles(photos);
}

/** Cameras number their files in capture order: sort by true time, then count per camera. */
function numberFiles(photos: DemoPhoto[]): DemoPhoto[] {
  const sorted = [...photos].sort((a, b) => a.trueLocalTime.localeCompare(b.trueLocalTime));
  const counters = new Map<string, number>();
  return sorted.map((p) => {
    const n = (counters.get(p.file) ?? 0) + 1;
    counters.set(p.file, n);
    return { ...p, file: `${p.file}/IMG_${String(n).padStart(4, '0')}.JPG` };
  });
}
