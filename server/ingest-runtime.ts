import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/database';
import { createImagePool, type ImagePool } from './images/pool';
import { PhotoStorage } from './images/storage';
import { blurHandler, derivativesFailed, derivativesHandler } from './jobs/photo-jobs';
import { JobRunner } from './jobs/runner';
import { createPatternPool, type PatternPool } from './pattern/pool';
import type { UploadLimits } from './middleware/upload-storage';
import { patternFeaturesHandler } from './services/pattern.service';
import { purgeExpiredHumanPhotos } from './services/retention.service';

/** Photo storage, the worker pool and the job runner: the moving parts of ingest. */
export interface IngestRuntime {
  storage: PhotoStorage;
  pool: ImagePool;
  /** Coat-pattern features and matching (one thread: each loads OpenCV, about 125 MB). */
  pattern: PatternPool;
  runner: JobRunner;
  limits: UploadLimits;
  maxMegapixels: number;
  stop(): Promise<void>;
}

/**
 * Prepares storage and recovers from an unclean stop (interrupted jobs queued again, temp files and
 * unreferenced files removed), then starts the job runner.
 */
export async function startIngest(
  db: Db,
  config: Config,
  log: Logger,
  options: { startRunner?: boolean } = {},
): Promise<IngestRuntime> {
  const storage = new PhotoStorage(config.uploadsDir);
  await storage.init();
  await db
    .updateTable('photos')
    .set({ status: 'queued' })
    .where('status', '=', 'processing')
    .execute();
  const referenced = new Set(
    (await db.selectFrom('photos').select('sha256').distinct().execute()).map((r) => r.sha256),
  );
  const swept = await storage.recover(referenced);
  if (swept.tmp || swept.orphans) log.info(swept, 'storage recovered after an unclean stop');

  const pool = createImagePool(config.workers);
  const pattern = createPatternPool(1);
  const runner = new JobRunner(
    db,
    log,
    {
      derivatives: {
        run: derivativesHandler(db, pool, storage),
        onFinalFailure: derivativesFailed(db),
      },
      blur: { run: blurHandler(db, pool, storage) },
      pattern: { run: patternFeaturesHandler(db, pattern, storage) },
    },
    pool.threads,
    500,
    config.jobRetryMs,
  );
  if (options.startRunner ?? true) await runner.start();
  // Photos of people past a project's retention period are deleted hourly.
  const retention = setInterval(() => {
    purgeExpiredHumanPhotos(db, storage).catch((err: unknown) =>
      log.error({ err }, 'retention sweep failed'),
    );
  }, 3600_000);
  retention.unref();
  return {
    storage,
    pool,
    pattern,
    runner,
    limits: {
      maxFileBytes: config.uploadMaxFileMb * 1_000_000,
      maxFilesPerRequest: config.uploadMaxFiles,
      maxRequestBytes: config.uploadMaxRequestMb * 1_000_000,
    },
    maxMegapixels: config.maxMegapixels,
    async stop() {
      clearInterval(retention);
      await runner.stop();
      await pool.close();
      await pattern.close();
    },
  };
}
