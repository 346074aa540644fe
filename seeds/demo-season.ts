/**
 * The demo season's photos, planned (not rendered): leopards with activity centres on the Kasiri
 * Hills grid pass stations with a half-normal chance by distance, both cameras of a pair firing on
 * opposite flanks; other species, wind-triggered blanks, a few people and vehicles; a setup board
 * at the start of every card. All synthetic. Deterministic for a seed.
 */
import { exifTimeOfWallClock } from './photos/exif';
import { Rng } from './photos/random';
import type { Flank, OtherSpecies, PhotoSpec, Subject } from './photos/types';
import { randomVariation } from './photos/variation';
import { DEMO_SEASON, demoDeployments, demoStations, type DemoDeployment } from './scenario';

/** One planned photo of one camera. */
export interface SeasonPhoto {
  stationCode: string;
  cameraLabel: 'A' | 'B';
  /** File name as the camera numbers it (restarts per card). */
  file: string;
  /** True time, ISO 8601 UTC. */
  trueTime: string;
  spec: PhotoSpec;
}

/** Options: photo size, seed, and how busy the season is (1 = the demo). */
export interface SeasonOptions {
  width: number;
  height: number;
  seed?: number;
  density?: number;
  quality?: number;
}

/** A leopard of the demo and where it lives (metres on the grid). */
export interface DemoLeopard {
  id: string;
  x: number;
  y: number;
}

const LOCAL_OFFSET_MS = 3 * 3600_000; // Africa/Nairobi, UTC+3 all year
const SIGMA_M = 1200;
const G0 = 0.05;
const OTHERS: OtherSpecies[] = ['bushbuck', 'porcupine', 'honeyBadger', 'baboon', 'genet'];

/** The demo's leopards: 14 animals with activity centres over the grid and a 1.5 km margin. */
export function demoLeopards(seed = 2026): DemoLeopard[] {
  const rng = new Rng(seed).fork('leopards');
  return Array.from({ length: 14 }, (_, i) => ({
    id: `P${String(i + 1).padStart(2, '0')}`,
    x: rng.range(-1500, 7500),
    y: rng.range(-1500, 9500),
  }));
}

function working(d: DemoDeployment, ms: number): boolean {
  const end = Math.min(Date.parse(d.end), d.lastWorking ? Date.parse(d.lastWorking) : Infinity);
  return ms >= Date.parse(d.start) && ms <= end;
}

/** Camera clock reading for a true time: right, or reset to 2000-01-01 at the start of the card. */
function cameraWallClock(d: DemoDeployment, trueMs: number): Date {
  if (d.clockResetAtStart) return new Date(Date.UTC(2000, 0, 1) + (trueMs - Date.parse(d.start)));
  return new Date(trueMs + LOCAL_OFFSET_MS);
}

interface Shot {
  deployment: DemoDeployment;
  trueMs: number;
  subject: Subject;
  burst: number;
  mirrorDir: number;
  seed: number;
}

function nightTime(rng: Rng, day: number): number {
  const start = Date.parse(`${DEMO_SEASON.start}T18:00:00Z`) - LOCAL_OFFSET_MS;
  return start + day * 86_400_000 + rng.int(0, 12 * 3600 - 1) * 1000;
}

function dayTime(rng: Rng, day: number): number {
  const start = Date.parse(`${DEMO_SEASON.start}T07:00:00Z`) - LOCAL_OFFSET_MS;
  return start + day * 86_400_000 + rng.int(0, 10 * 3600 - 1) * 1000;
}

/** Plans every photo of the demo season, cards numbered per camera in capture order. */
export function demoSeason(opts: SeasonOptions): SeasonPhoto[] {
  const density = opts.density ?? 1;
  const rng = new Rng(opts.seed ?? 2026);
  const stations = demoStations();
  const deployments = demoDeployments();
  const camerasOf = (code: string) => deployments.filter((d) => d.stationCode === code);
  const shots: Shot[] = [];

  for (const d of deployments) {
    // The setup board: the first photo of every card, showing the true local time.
    const at = Date.parse(d.start) + 120_000;
    const local = new Date(at + LOCAL_OFFSET_MS).toISOString();
    const subject: Subject = {
      kind: 'setup',
      lines: [`${d.stationCode} ${d.cameraLabel}`, local.slice(0, 10), local.slice(11, 19)],
    };
    shots.push({
      deployment: d,
      trueMs: at,
      subject,
      burst: 1,
      mirrorDir: 1,
      seed: rng.int(0, 2 ** 30),
    });
  }

  const leopardRng = rng.fork('passes');
  for (const leopard of demoLeopards(opts.seed)) {
    for (let day = 0; day < DEMO_SEASON.days; day++) {
      for (const station of stations) {
        const d2 = (station.x - leopard.x) ** 2 + (station.y - leopard.y) ** 2;
        if (!leopardRng.chance(density * G0 * Math.exp(-d2 / (2 * SIGMA_M * SIGMA_M)))) continue;
        const t = nightTime(leopardRng, day);
        const flankA = leopardRng.pick<Flank>(['left', 'right']);
        const seed = leopardRng.int(0, 2 ** 30);
        for (const cam of camerasOf(station.code)) {
          if (!working(cam, t) || !leopardRng.chance(0.85)) continue;
          const flank: Flank =
            cam.cameraLabel === 'A' ? flankA : flankA === 'left' ? 'right' : 'left';
          shots.push({
            deployment: cam,
            trueMs: t + (cam.cameraLabel === 'B' ? 1000 : 0),
            subject: { kind: 'target', individual: leopard.id, flank },
            burst: 2,
            mirrorDir: cam.cameraLabel === 'A' ? 1 : -1,
            seed,
          });
        }
      }
    }
  }

  const otherRng = rng.fork('others');
  for (let day = 0; day < DEMO_SEASON.days; day++) {
    for (const station of stations) {
      const cams = camerasOf(station.code);
      const add = (subject: Subject, t: number, burst: number) => {
        const cam = otherRng.pick(cams);
        if (working(cam, t))
          shots.push({
            deployment: cam,
            trueMs: t,
            subject,
            burst,
            mirrorDir: 1,
            seed: otherRng.int(0, 2 ** 30),
          });
      };
      if (otherRng.chance(0.018 * density)) {
        const night = otherRng.chance(0.6);
        add(
          { kind: 'animal', species: otherRng.pick(OTHERS) },
          night ? nightTime(otherRng, day) : dayTime(otherRng, day),
          2,
        );
      }
      if (otherRng.chance(0.025 * density))
        add({ kind: 'blank' }, dayTime(otherRng, day), otherRng.int(1, 3));
      if (otherRng.chance(0.004 * density)) add({ kind: 'human' }, dayTime(otherRng, day), 2);
      const road = cams.some((c) => c.featureType === 'roadDirt');
      if (road && otherRng.chance(0.006 * density))
        add({ kind: 'vehicle' }, dayTime(otherRng, day), 2);
    }
  }
  return numberFiles(shots.flatMap((shot) => expand(shot, opts, rng)));
}

function expand(shot: Shot, opts: SeasonOptions, rng: Rng): SeasonPhoto[] {
  const d = shot.deployment;
  const station = demoStations().find((s) => s.code === d.stationCode)!;
  const localHour = new Date(shot.trueMs + LOCAL_OFFSET_MS).getUTCHours();
  const lighting = localHour >= 18 || localHour < 6 ? 'infrared' : 'day';
  const base = randomVariation(shot.seed, 0.5, shot.subject.kind);
  const heading = shot.subject.kind === 'target' ? (shot.subject.flank === 'right' ? 1 : -1) : 1;
  const out: SeasonPhoto[] = [];
  for (let k = 0; k < shot.burst; k++) {
    const trueMs = shot.trueMs + k * 1500;
    out.push({
      stationCode: d.stationCode,
      cameraLabel: d.cameraLabel,
      file: '',
      trueTime: new Date(trueMs).toISOString().replace('.000Z', 'Z'),
      spec: {
        width: opts.width,
        height: opts.height,
        seed: rng.int(0, 2 ** 30),
        station: d.stationCode,
        camera: d.cameraLabel,
        lighting,
        subject: shot.subject,
        variation: {
          ...base,
          position:
            (base.position ?? 0) * shot.mirrorDir + heading * (k - (shot.burst - 1) / 2) * 0.35,
          gait: ((base.gait ?? 0) + k * 0.3) % 1,
        },
        quality: opts.quality ?? 82,
        exif: {
          dateTimeOriginal: exifTimeOfWallClock(cameraWallClock(d, trueMs)),
          subSecTimeOriginal: String(rng.int(0, 99)).padStart(2, '0'),
          make: 'Kasiri Trailcam',
          model: 'KT-2',
          serial: d.cameraSerial,
          gps: { lat: station.lat + rng.normal(0.00004), lon: station.lon + rng.normal(0.00004) },
        },
      },
    });
  }
  return out;
}

/** Cameras number their files in capture order, starting again on every card. */
function numberFiles(photos: SeasonPhoto[]): SeasonPhoto[] {
  const sorted = [...photos].sort(
    (a, b) => a.trueTime.localeCompare(b.trueTime) || a.cameraLabel.localeCompare(b.cameraLabel),
  );
  const counters = new Map<string, number>();
  return sorted.map((p) => {
    const key = `${p.stationCode}-${p.cameraLabel}`;
    const n = (counters.get(key) ?? 0) + 1;
    counters.set(key, n);
    return { ...p, file: `IMG_${String(n).padStart(4, '0')}.JPG` };
  });
}
