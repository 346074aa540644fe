/**
 * SECR fits of saved analyses: each runs in the SECR worker thread after the analysis is saved;
 * its progress lives here while it runs, and the finished fit is written into the analysis row.
 */
import type { Logger } from 'pino';
import type { AnalysisResults } from '../../shared/analyses';
import type { SecrRequest } from '../../shared/estimate';
import type { SecrProgressView } from '../../shared/estimate-api';
import type { Db } from '../db/database';
import { ApiError } from '../errors/api-error';
import { fitSecrOffThread } from './secr-fits.service';

/** In-memory progress of the density fits of saved analyses (one instance per app). */
export class AnalysisRuns {
  private readonly progress = new Map<string, SecrProgressView>();
  private readonly settling = new Map<string, Promise<void>>();

  constructor(
    private readonly db: Db,
    private readonly log: Logger,
  ) {}

  /** True while the analysis's fit is queued or running in this server. */
  isRunning(analysisId: string): boolean {
    return this.progress.has(analysisId);
  }

  /** Progress of a running fit, or null. */
  progressOf(analysisId: string): SecrProgressView | null {
    return this.progress.get(analysisId) ?? null;
  }

  /** Resolves when the analysis's fit has been written (at once when none is running). */
  async settled(analysisId: string): Promise<void> {
    await this.settling.get(analysisId);
  }

  /** Starts the fit; the analysis row must already exist with status running. */
  start(analysisId: string, input: SecrRequest): void {
    this.progress.set(analysisId, {
      stage: 'queued; starts when the fitting worker is free',
      fraction: 0,
    });
    const run = fitSecrOffThread(input, (p) => this.progress.set(analysisId, p))
      .then((secr) => this.finish(analysisId, { secr, secrReason: secr.reason ?? null }, null))
      .catch((err: unknown) => {
        // Input the fit cannot use is an answer (no density, with the reason); a crash is a failure.
        if (err instanceof ApiError)
          return this.finish(analysisId, { secr: null, secrReason: err.message }, null);
        this.log.error({ err, analysisId }, 'analysis SECR failed');
        const message = 'The density fit failed on the server; re-run the analysis to try again.';
        return this.finish(analysisId, { secr: null, secrReason: message }, message);
      })
      .finally(() => {
        this.progress.delete(analysisId);
        this.settling.delete(analysisId);
      });
    this.settling.set(analysisId, run);
  }

  private async finish(
    analysisId: string,
    secr: Pick<AnalysisResults, 'secr' | 'secrReason'>,
    error: string | null,
  ): Promise<void> {
    const row = await this.db
      .selectFrom('analyses')
      .select('results')
      .where('id', '=', analysisId)
      .executeTakeFirst();
    if (!row) return; // deleted with its project meanwhile
    const results = { ...(JSON.parse(row.results) as AnalysisResults), ...secr };
    await this.db
      .updateTable('analyses')
      .set({
        results: JSON.stringify(results),
        status: error ? 'failed' : 'done',
        error,
        finished_at: new Date().toISOString(),
      })
      .where('id', '=', analysisId)
      .execute();
  }
}
