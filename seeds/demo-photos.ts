import { createHash } from 'node:crypto';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import type { Logger } from 'pino';
import type { Db } from '../server/db/database';
import type { IngestRuntime } from '../server/ingest-runtime';
import type { ReceivedFile } from '../server/middleware/upload-storage';
import { regroupStation } from '../server/services/events.service';
import { ingestFiles } from '../server/services/ingest.service';
import { createUpload } from '../server/services/uploads.service';
import { demoSeason, type SeasonPhoto } from './demo-season';
import { renderSet } from './photos/index';
import type { PhotoTruth } from './photos/types';

/** Bumped when the painter changes, so cached photos are painted again. */
const PAINTER_VERSION = 1;

/** What the demo knows about each ingested photo: the plan and what the photo really shows. */
export interface SeededPhoto {
  photoId: string;
  plan: SeasonPhoto;
  truth: Pick<
    PhotoTruth,
    'kind' | 'species' | 'individualId' | 'flank' | 'bbox' | 'occludedFraction'
  >;
}

function cacheKey(photo: SeasonPhoto): string {
  return createHash('sha256')
    .update(JSON.stringify({ v: PAINTER_VERSION, spec: photo.spec }))
    .digest('hex')
    .slice(0, 32);
}

/**
 * Paints the season's photos (or takes them from the cache beside the database, so a fresh demo
 * database does not repaint), then uploads each camera's card as the volunteer would.
 */
export async function seedDemoPhotos(
  db: Db,
  input: {
    projectId: string;
    uploaderId: string;
    cacheDir: string;
    ingest: IngestRuntime;
    log?: Logger;
  },
): Promise<SeededPhoto[]> {
  const plan = demoSeason({ width: 1024, height: 768 });
  const cached = new Map<number, { jpeg: Buffer; truth: SeededPhoto['truth'] }>();
  const missing: number[] = [];
  for (const [i, p] of plan.entries()) {
    const base = join(input.cacheDir, cacheKey(p));
    try {
      const [jpeg, truth] = await Promise.all([
        readFile(`${base}.jpg`),
        readFile(`${base}.json`, 'utf8'),
      ]);
      cached.set(i, { jpeg, truth: JSON.parse(truth) as SeededPhoto['truth'] });
    } catch {
      missing.push(i);
    }
  }
  if (missing.length) {
    input.log?.info(
      `painting ${missing.length} demo photos (once; they are cached in ${input.cacheDir})`,
    );
    await mkdir(input.cacheDir, { recursive: true });
    let painted = 0;
    await renderSet(
      missing.map((i) => plan[i]!.spec),
      {
        concurrency: 2,
        onPhoto: async (k, photo) => {
          const i = missing[k]!;
          const { kind, species, individualId, flank, bbox, occludedFraction } = photo.truth;
          const truth = { kind, species, individualId, flank, bbox, occludedFraction };
          const base = join(input.cacheDir, cacheKey(plan[i]!));
          await writeFile(`${base}.jpg`, photo.jpeg);
          await writeFile(`${base}.json`, JSON.stringify(truth));
          cached.set(i, { jpeg: photo.jpeg, truth });
          painted++;
          if (painted % 50 === 0)
            input.log?.info(`painted ${painted}/${missing.length} demo photos`);
        },
      },
    );
  }
  return ingestCards(db, input, plan, cached);
}

async function ingestCards(
  db: Db,
  input: { projectId: string; uploaderId: string; ingest: IngestRuntime },
  plan: SeasonPhoto[],
  photos: Map<number, { jpeg: Buffer; truth: SeededPhoto['truth'] }>,
): Promise<SeededPhoto[]> {
  const project = await db
    .selectFrom('projects')
    .selectAll()
    .where('id', '=', input.projectId)
    .executeTakeFirstOrThrow();
  const deployments = await db
    .selectFrom('deployments')
    .innerJoin('stations', 'stations.id', 'deployments.station_id')
    .selectAll('deployments')
    .select('stations.code')
    .where('deployments.project_id', '=', project.id)
    .execute();
  const seeded: SeededPhoto[] = [];
  for (const d of deployments) {
    const card = [...plan.entries()].filter(
      ([, p]) => p.stationCode === d.code && p.cameraLabel === d.camera_label,
    );
    if (card.length === 0) continue;
    const station = await db
      .selectFrom('stations')
      .selectAll()
      .where('id', '=', d.station_id)
      .executeTakeFirstOrThrow();
    const uploadId = await createUpload(db, project.id, d.id, input.uploaderId);
    const files: ReceivedFile[] = [];
    for (const [i, p] of card) {
      const jpeg = photos.get(i)!.jpeg;
      const tmpPath = input.ingest.storage.tmpPath();
      await mkdir(dirname(tmpPath), { recursive: true });
      await writeFile(tmpPath, jpeg);
      files.push({
        rawName: p.file,
        tmpPath,
        size: jpeg.length,
        sha256: createHash('sha256').update(jpeg).digest('hex'),
        refused: null,
      });
    }
    const results = await ingestFiles(
      {
        db,
        storage: input.ingest.storage,
        maxMegapixels: input.ingest.maxMegapixels,
        project,
        deployment: d,
        station,
        uploadId,
      },
      files,
    );
    results.forEach((r, k) => {
      const [i, p] = card[k]!;
      if (r.photoId && r.status === 'accepted')
        seeded.push({ photoId: r.photoId, plan: p, truth: photos.get(i)!.truth });
    });
  }
  const stations = await db
    .selectFrom('stations')
    .select('id')
    .where('project_id', '=', project.id)
    .execute();
  for (const s of stations)
    await regroupStation(db, project.id, s.id, project.independence_minutes);
  input.ingest.runner.kick();
  return seeded;
}
