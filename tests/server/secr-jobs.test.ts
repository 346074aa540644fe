import { pino } from 'pino';
import { afterAll, describe, expect, it } from 'vitest';
import type { SecrRequest } from '../../shared/estimate';
import type { SecrJobView } from '../../shared/estimate-api';
import { ApiError } from '../../server/errors/api-error';
import { trapGrid } from '../../server/estimation/secr/simulate';
import {
  SECR_JOB_TTL_MS,
  SECR_JOBS_PER_USER,
  SecrJobs,
} from '../../server/services/secr-fits.service';
import { closeSecrPool } from '../../server/workers/secr-pool';

// Synthetic inputs; the clock is injected so expiry is checked without waiting 30 minutes.

afterAll(async () => closeSecrPool());

const tiny: SecrRequest = {
  traps: trapGrid(3, 3, 50),
  occasions: 2,
  detector: 'proximity',
  captures: [
    { animal: 'a', occasion: 1, trap: 'T1' },
    { animal: 'a', occasion: 2, trap: 'T2' },
    { animal: 'b', occasion: 1, trap: 'T5' },
    { animal: 'b', occasion: 2, trap: 'T6' },
  ],
};

async function settle(jobs: SecrJobs, user: string, id: string): Promise<SecrJobView> {
  for (;;) {
    const job = jobs.view(user, id);
    if (job.status !== 'running') return job;
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('SecrJobs', () => {
  it('should forget a finished job 30 minutes after it finished, not before', async () => {
    let now = 1_000_000;
    const jobs = new SecrJobs(pino({ level: 'silent' }), () => now);
    const { id } = jobs.start('u1', tiny);
    expect((await settle(jobs, 'u1', id)).status).toBe('done');
    now += SECR_JOB_TTL_MS - 1000;
    expect(jobs.view('u1', id).status).toBe('done');
    now += 2000;
    expect(() => jobs.view('u1', id)).toThrow(ApiError);
  });

  it('should refuse more running fits per person than the limit with 429', async () => {
    const jobs = new SecrJobs(pino({ level: 'silent' }));
    const slow = { ...tiny, mask: { spacing: 1.5, buffer: 100 } };
    const ids = Array.from({ length: SECR_JOBS_PER_USER }, () => jobs.start('u1', slow).id);
    let refusal: unknown;
    try {
      jobs.start('u1', slow);
    } catch (err) {
      refusal = err;
    }
    expect(refusal).toBeInstanceOf(ApiError);
    expect((refusal as ApiError).status).toBe(429);
    expect(jobs.start('u2', tiny).id).toMatch(/^[0-9a-f]{20}$/); // someone else may still start
    await closeSecrPool(); // abandons the slow fits
    for (const id of ids) expect((await settle(jobs, 'u1', id)).status).toBe('failed');
  });
});
