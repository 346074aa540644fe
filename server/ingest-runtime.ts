import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/database';
import { createImagePool, type ImagePool } from './images/pool';
import { PhotoStorage } from './images/storage';
import { derivativesFailed, derivativesHandler } from './jobs/photo-jobs';
import { JobRunner } from './jobs/runner';
import type { UploadLimits } from './middleware/upload-storage';

/** Photo storage, the worker pool and the job runner: the moving parts of ingest. */
export interface IngestRuntime {
  storage: PhotoStorage;
  pool: ImagePool;
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
  const runner = new JobRunner(
    db,
    log,
    {
      derivatives: {
        run: derivativesHandler(db, pool, storage),
        onFinalFailure: derivativesFailed(db),
      },
    },
    pool.threads,
    500,
    config.jobRetryMs,
  );
  if (options.startRunner ?? true) await runner.start();
  return {
    storage,
    pool,
    runner,
    limits: {
      maxFileBytes: config.uploadMaxFileMb * 1_000_000,
      maxFilesPerRequest: config.uploadMaxFiles,
      maxRequestBytes: config.uploadMaxRequestMb * 1_000_000,
    },
    maxMegapixels: config.maxMegapixels,
    async stop() {
      await runner.stop();
      await pool.close();
    },
  };
}
