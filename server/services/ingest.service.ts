import { readFile } from 'node:fs/promises';
import type { FileResult, RejectCode } from '../../shared/ingest';
import type { Db } from '../db/database';
import type { DeploymentsTable, PhotosTable, StationsTable } from '../db/schema/ingest.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { readExif, readExifThumbnail } from '../images/exif';
import { sniffUpload } from '../images/sniff';
import type { PhotoStorage } from '../images/storage';
import type { ReceivedFile } from '../middleware/upload-storage';
import { correctedTime, exifWallClock } from './camera-time';
import { checkFileName } from './file-names';
import { newId, nowIso } from './ids';
import { enqueueJob } from './jobs.service';
import { photoFlags } from './photo-flags';

/** Everything one card upload request works within. */
export interface IngestContext {
  db: Db;
  storage: PhotoStorage;
  maxMegapixels: number;
  project: ProjectsTable;
  deployment: DeploymentsTable;
  station: StationsTable;
  uploadId: string;
}

type Outcome = FileResult & { seq?: number };

function rejected(name: string, code: RejectCode, message: string): Outcome {
  return { name, status: 'rejected', code, message };
}

function isUniqueViolation(err: unknown): boolean {
  return (
    err instanceof Error &&
    /UNIQUE constraint failed: photos\.project_id, photos\.sha256/.test(err.message)
  );
}

async function duplicateOf(db: Db, projectId: string, sha256: string): Promise<string | null> {
  const row = await db
    .selectFrom('photos')
    .select('id')
    .where('project_id', '=', projectId)
    .where('sha256', '=', sha256)
    .executeTakeFirst();
  return row?.id ?? null;
}

/** Checks, stores and records one received file; every file gets its own verdict. */
async function ingestOne(ctx: IngestContext, file: ReceivedFile): Promise<Outcome> {
  const nameCheck = checkFileName(file.rawName);
  const discard = () => (file.tmpPath ? ctx.storage.discard(file.tmpPath) : Promise.resolve());
  if (!nameCheck.ok) {
    await discard();
    return rejected(nameCheck.name, 'bad_file_name', nameCheck.message);
  }
  const name = nameCheck.name;
  if (file.refused) return rejected(name, file.refused.code, file.refused.message);
  if (!file.tmpPath || !file.sha256)
    return rejected(name, 'unreadable', 'The file could not be received.');

  const sniffed = await sniffUpload(file.tmpPath, file.size, ctx.maxMegapixels);
  if (!sniffed.ok) {
    await discard();
    return rejected(name, sniffed.code, sniffed.message);
  }
  const existing = await duplicateOf(ctx.db, ctx.project.id, file.sha256);
  if (existing) {
    await discard();
    return {
      name,
      status: 'duplicate',
      photoId: existing,
      message: 'These exact bytes are already in the project.',
    };
  }

  const bytes = await readFile(file.tmpPath);
  const exif = await readExif(bytes);
  const thumb = await readExifThumbnail(bytes);
  const storedPath = await ctx.storage.adoptOriginal(file.tmpPath, file.sha256);
  if (thumb)
    await ctx.storage.writeAtomic(ctx.storage.derivedPath(file.sha256, 'exif-thumb'), thumb);

  const takenAt = correctedTime(exif, ctx.deployment.timezone, ctx.deployment.clock_offset_seconds);
  const takenAtExif = exif.dateTimeOriginal
    ? exifWallClock(exif.dateTimeOriginal, exif.subSec)
    : null;
  const flags = photoFlags(
    {
      takenAtExif,
      takenAt,
      exifReadable: exif.readable,
      lat: exif.lat,
      lon: exif.lon,
      serial: exif.serial,
    },
    {
      deployment: ctx.deployment,
      station: ctx.station,
      gpsToleranceM: ctx.project.gps_tolerance_m,
    },
  );
  const photo: PhotosTable = {
    id: newId(),
    project_id: ctx.project.id,
    deployment_id: ctx.deployment.id,
    upload_id: ctx.uploadId,
    sha256: file.sha256,
    original_name: name,
    stored_path: storedPath,
    bytes: file.size,
    width: sniffed.width,
    height: sniffed.height,
    taken_at_exif: takenAtExif,
    taken_at: takenAt,
    gps_lat: exif.lat,
    gps_lon: exif.lon,
    make: exif.make,
    model: exif.model,
    serial: exif.serial,
    status: 'queued',
    error: null,
    flags: JSON.stringify(flags),
    exif_thumb: thumb ? 1 : 0,
    event_id: null,
    created_at: nowIso(),
  };
  try {
    await ctx.db.transaction().execute(async (trx) => {
      await trx.insertInto('photos').values(photo).execute();
      await enqueueJob(trx, 'derivatives', { photoId: photo.id });
    });
  } catch (err) {
    // Two requests raced with the same bytes: the other one stored the row first.
    if (isUniqueViolation(err)) {
      const other = await duplicateOf(ctx.db, ctx.project.id, file.sha256);
      return {
        name,
        status: 'duplicate',
        photoId: other ?? undefined,
        message: 'These exact bytes are already in the project.',
      };
    }
    throw err;
  }
  return { name, status: 'accepted', photoId: photo.id };
}

/**
 * Ingests the files of one request in order and records each verdict and the upload's counts.
 * Files are placed at their content address before their row is written, so a crash can leave a
 * file without a row (swept at start) but never a row without a file.
 */
export async function ingestFiles(
  ctx: IngestContext,
  files: ReceivedFile[],
): Promise<FileResult[]> {
  const results: FileResult[] = [];
  const last = await ctx.db
    .selectFrom('upload_files')
    .select((eb) => eb.fn.max('seq').as('seq'))
    .where('upload_id', '=', ctx.uploadId)
    .executeTakeFirst();
  let seq = Number(last?.seq ?? 0);
  for (const file of files) {
    let outcome: Outcome;
    try {
      outcome = await ingestOne(ctx, file);
    } catch {
      if (file.tmpPath) await ctx.storage.discard(file.tmpPath);
      outcome = rejected(
        checkFileName(file.rawName).name,
        'unreadable',
        'The file could not be read; it may be damaged.',
      );
    }
    results.push(outcome);
    seq++;
    await ctx.db
      .insertInto('upload_files')
      .values({
        id: newId(),
        upload_id: ctx.uploadId,
        seq,
        name: outcome.name,
        status: outcome.status,
        code: outcome.code ?? null,
        message: outcome.message ?? null,
        photo_id: outcome.photoId ?? null,
      })
      .execute();
  }
  const count = (status: FileResult['status']) => results.filter((r) => r.status === status).length;
  await ctx.db
    .updateTable('card_uploads')
    .set((eb) => ({
      accepted: eb('accepted', '+', count('accepted')),
      duplicate: eb('duplicate', '+', count('duplicate')),
      rejected: eb('rejected', '+', count('rejected')),
    }))
    .where('id', '=', ctx.uploadId)
    .execute();
  return results;
}
