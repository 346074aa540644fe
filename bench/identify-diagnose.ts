/**
 * Looks inside `GET identify/next` without HTTP, in this process and one thread: the statements of
 * the lease with SQLite's plans, the sighting's own queries, building the candidate pool (cold), and
 * ranking the catalogue for a sighting (warm) — with and without typed search text.
 */
import { join } from 'node:path';
import { bumpCatalogue, candidatePool } from '../server/services/catalogue-cache';
import {
  candidatesFor,
  leaseNextSighting,
  releaseSighting,
  sightingToIdentify,
} from '../server/services/identify.service';
import { meFor } from '../server/services/users.service';
import { round } from './report';
import { loggingDb, profileStatements, timeRepeated, type StatementProfile } from './sort-diagnose';

/** Median milliseconds of each step of the endpoint, and the lease's statements. */
export interface IdentifyDiagnosis {
  leaseMedianMs: number;
  leaseStatements: StatementProfile[];
  sightingMedianMs: number;
  sightingStatements: StatementProfile[];
  /** Building the cached pool of active individuals (queries, references, fuse index). */
  poolBuildMs: number[];
  candidatesMedianMs: number;
  candidatesStatements: StatementProfile[];
  /** Candidates with a typed description (`?q=`), through the same ranking. */
  candidatesWithTextMedianMs: number;
  meMedianMs: number;
  poolEntries: number;
}

/**
 * Profiles the endpoint for one reviewer on the database in `dataDir` (the lease is given back
 * afterwards); run it before the server starts.
 */
export async function diagnoseIdentify(
  dataDir: string,
  projectId: string,
  reviewerId: string,
  runs = 30,
): Promise<IdentifyDiagnosis> {
  const { db, sqlite, events } = loggingDb(join(dataDir, 'maculo.sqlite'));
  try {
    const project = await db
      .selectFrom('projects')
      .selectAll()
      .where('id', '=', projectId)
      .executeTakeFirstOrThrow();
    let sightingId = '';
    const lease = await timeRepeated(events, runs, async () => {
      sightingId = (await leaseNextSighting(db, projectId, reviewerId, [])) ?? '';
    });
    if (!sightingId) throw new Error('no sighting to identify for the first reviewer');
    const sighting = await timeRepeated(events, runs, () =>
      sightingToIdentify(db, projectId, sightingId),
    );
    const view = await sightingToIdentify(db, projectId, sightingId);
    const poolBuildMs: number[] = [];
    for (let i = 0; i < 3; i++) {
      bumpCatalogue(projectId);
      const t0 = performance.now();
      await candidatePool(db, projectId);
      poolBuildMs.push(round(performance.now() - t0, 1));
    }
    const candidates = await timeRepeated(events, runs, () => candidatesFor(db, project, view));
    const withText = await timeRepeated(events, runs, () =>
      candidatesFor(db, project, view, 'notch in left ear, broken rosette on right shoulder'),
    );
    const me = await timeRepeated(events, runs, () => meFor(db, reviewerId));
    await releaseSighting(db, sightingId, reviewerId);
    return {
      leaseMedianMs: round(lease.median, 3),
      leaseStatements: profileStatements(sqlite, lease.byStatement),
      sightingMedianMs: round(sighting.median, 3),
      sightingStatements: profileStatements(sqlite, sighting.byStatement),
      poolBuildMs,
      candidatesMedianMs: round(candidates.median, 3),
      candidatesStatements: profileStatements(sqlite, candidates.byStatement),
      candidatesWithTextMedianMs: round(withText.median, 3),
      meMedianMs: round(me.median, 3),
      poolEntries: (await candidatePool(db, projectId)).entries.length,
    };
  } finally {
    await db.destroy();
  }
}
