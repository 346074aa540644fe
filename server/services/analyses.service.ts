/**
 * Saved analyses: run and save with a data freeze, list, read with the freeze checked against
 * today's catalogue, and re-run the same parameters to show what changed.
 */
import type {
  AnalysisDetail,
  AnalysisListItem,
  AnalysisPage,
  AnalysisParameters,
  AnalysisResults,
  AnalysisStatus,
  ChangeSince,
  CreateAnalysisBody,
  FreezeStatus,
  RerunComparison,
  SessionInputs,
} from '../../shared/analyses';
import type { Db } from '../db/database';
import type { AnalysesTable } from '../db/schema/analyses.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError, notFound } from '../errors/api-error';
import { compareRuns } from './analysis-compare';
import type { AnalysisRuns } from './analysis-runs';
import { decodeCursor, encodeCursor } from './cursor';
import { newId } from './ids';
import { assertSecrCanStart, fitSecrOffThread } from './secr-fits.service';
import { buildSession, normaliseSession } from './session-build.service';
import { estimateSession, secrRequestOf } from './session-models.service';

const INTERRUPTED = 'The server stopped while the density fit was running; re-run the analysis.';

/** Runs every requested model on the session and saves the analysis; SECR finishes afterwards. */
export async function createAnalysis(
  db: Db,
  project: ProjectsTable,
  body: CreateAnalysisBody,
  userId: string,
  runs: AnalysisRuns,
): Promise<string> {
  const parameters: AnalysisParameters = {
    session: normaliseSession(project, body.session),
    secr: body.secr,
  };
  const session = await buildSession(db, project, parameters.session);
  const results = estimateSession(session, parameters.secr !== null);
  const secrInput =
    parameters.secr && results.secrReason === null
      ? secrRequestOf(session.inputs, parameters.secr)
      : null;
  // Refuse a fit that cannot start (too large, server busy) before saving anything.
  if (secrInput) assertSecrCanStart(secrInput);
  const id = newId();
  await db
    .insertInto('analyses')
    .values({
      id,
      project_id: project.id,
      name: body.name,
      parameters: JSON.stringify(parameters),
      freeze_hash: session.hash,
      inputs: JSON.stringify(session.inputs),
      results: JSON.stringify(results),
      status: secrInput ? 'running' : 'done',
      error: null,
      created_by: userId,
      created_at: new Date().toISOString(),
      finished_at: secrInput ? null : new Date().toISOString(),
    })
    .execute();
  if (secrInput) runs.start(id, secrInput);
  return id;
}

async function analysisRow(db: Db, projectId: string, id: string) {
  const row = await db
    .selectFrom('analyses')
    .leftJoin('users', 'users.id', 'analyses.created_by')
    .selectAll('analyses')
    .select('users.name as creator')
    .where('analyses.id', '=', id)
    .where('analyses.project_id', '=', projectId)
    .executeTakeFirst();
  if (!row) throw notFound('This analysis');
  return row;
}

/** A fit that is neither running here nor finished was cut off by a restart: say so. */
async function settleOrphan(db: Db, row: AnalysesTable, runs: AnalysisRuns): Promise<void> {
  if (row.status !== 'running' || runs.isRunning(row.id)) return;
  // The fit may have finished between reading the row and asking: read it again.
  const fresh = await db
    .selectFrom('analyses')
    .selectAll()
    .where('id', '=', row.id)
    .executeTakeFirstOrThrow();
  if (fresh.status === 'running') {
    const results = { ...(JSON.parse(fresh.results) as AnalysisResults), secrReason: INTERRUPTED };
    await db
      .updateTable('analyses')
      .set({ status: 'failed', error: INTERRUPTED, results: JSON.stringify(results) })
      .where('id', '=', row.id)
      .execute();
    Object.assign(row, { status: 'failed', error: INTERRUPTED, results: JSON.stringify(results) });
  } else Object.assign(row, fresh);
}

/** Identity changes after the analysis was saved that touched any of its individuals. */
async function changesSince(
  db: Db,
  projectId: string,
  createdAt: string,
  inputs: SessionInputs,
): Promise<ChangeSince[]> {
  const mine = new Set(inputs.individuals.map((i) => i.id));
  const codes = new Map(inputs.individuals.map((i) => [i.id, i.code]));
  const rows = await db
    .selectFrom('identity_changes')
    .select(['id', 'kind', 'at', 'reason', 'individuals'])
    .where('project_id', '=', projectId)
    .where('at', '>=', createdAt.slice(0, 19))
    .orderBy('at')
    .orderBy('id')
    .execute();
  const saved = Date.parse(createdAt);
  return rows
    .filter((r) => Date.parse(r.at) >= saved)
    .map((r) => ({ ...r, touched: JSON.parse(r.individuals) as string[] }))
    .filter((r) => r.touched.some((i) => mine.has(i)))
    .map((r) => ({
      id: r.id,
      kind: r.kind,
      at: r.at,
      reason: r.reason,
      individuals: r.touched.map((i) => codes.get(i) ?? i),
    }));
}

/** Rebuilds the inputs with the saved parameters and compares hashes. */
export async function freezeStatus(
  db: Db,
  project: ProjectsTable,
  row: Pick<AnalysesTable, 'freeze_hash' | 'created_at'>,
  parameters: AnalysisParameters,
  inputs: SessionInputs,
): Promise<FreezeStatus> {
  let currentHash: string | null = null;
  let problem: string | null = null;
  try {
    currentHash = (await buildSession(db, project, parameters.session)).hash;
  } catch (err) {
    if (!(err instanceof ApiError)) throw err;
    problem = `The session can no longer be rebuilt: ${err.message}`;
  }
  return {
    hash: row.freeze_hash,
    currentHash,
    matches: currentHash === row.freeze_hash,
    problem,
    changesSince: await changesSince(db, project.id, row.created_at, inputs),
    checkedAt: new Date().toISOString(),
  };
}

/** One analysis with its results, progress while SECR runs, and the freeze checked today. */
export async function getAnalysis(
  db: Db,
  project: ProjectsTable,
  id: string,
  runs: AnalysisRuns,
): Promise<AnalysisDetail> {
  const row = await analysisRow(db, project.id, id);
  await settleOrphan(db, row, runs);
  const parameters = JSON.parse(row.parameters) as AnalysisParameters;
  const inputs = JSON.parse(row.inputs) as SessionInputs;
  return {
    id: row.id,
    name: row.name,
    status: row.status as AnalysisStatus,
    error: row.error,
    parameters,
    hash: row.freeze_hash,
    inputs,
    results: JSON.parse(row.results) as AnalysisResults,
    createdAt: row.created_at,
    createdBy: row.creator,
    finishedAt: row.finished_at,
    progress: runs.progressOf(row.id),
    freeze: await freezeStatus(db, project, row, parameters, inputs),
  };
}

/** The project's analyses, newest first, in keyset pages. */
export async function listAnalyses(
  db: Db,
  projectId: string,
  page: { after?: string; limit: number },
): Promise<AnalysisPage> {
  let q = db
    .selectFrom('analyses')
    .leftJoin('users', 'users.id', 'analyses.created_by')
    .select([
      'analyses.id',
      'analyses.name',
      'analyses.status',
      'analyses.created_at',
      'analyses.freeze_hash',
      'analyses.parameters',
      'analyses.results',
      'users.name as creator',
    ])
    .where('analyses.project_id', '=', projectId);
  if (page.after) {
    const [at, id] = decodeCursor(page.after, 2) as [string, string];
    q = q.where((eb) =>
      eb.or([
        eb('analyses.created_at', '<', at),
        eb.and([eb('analyses.created_at', '=', at), eb('analyses.id', '<', id)]),
      ]),
    );
  }
  const rows = await q
    .orderBy('analyses.created_at', 'desc')
    .orderBy('analyses.id', 'desc')
    .limit(page.limit + 1)
    .execute();
  const items = rows.slice(0, page.limit).map((r): AnalysisListItem => {
    const parameters = JSON.parse(r.parameters) as AnalysisParameters;
    const results = JSON.parse(r.results) as AnalysisResults;
    const bestModel = results.closed?.aiccTable.rows[0]?.model;
    const best = [...(results.closed?.models ?? []), ...(results.closed?.otherModels ?? [])].find(
      (m) => m.model === bestModel,
    );
    return {
      id: r.id,
      name: r.name,
      status: r.status as AnalysisStatus,
      createdAt: r.created_at,
      createdBy: r.creator,
      hash: r.freeze_hash,
      start: parameters.session.start,
      end: parameters.session.end,
      flankPolicy: parameters.session.flankPolicy,
      individuals: results.summary.individuals,
      occasions: results.summary.occasions,
      best: best && best.N !== null ? { model: best.model, N: best.N } : null,
      densityPer100km2: results.secr?.densityPer100km2 ?? null,
    };
  });
  const last = rows.length > page.limit ? rows[page.limit - 1] : undefined;
  return { items, next: last ? encodeCursor([last.created_at, last.id]) : null };
}

/** Today's catalogue under the saved parameters, fitted like the original, beside the saved run. */
export async function rerunAnalysis(
  db: Db,
  project: ProjectsTable,
  id: string,
  signal?: AbortSignal,
): Promise<RerunComparison> {
  const row = await analysisRow(db, project.id, id);
  const parameters = JSON.parse(row.parameters) as AnalysisParameters;
  const inputs = JSON.parse(row.inputs) as SessionInputs;
  const saved = JSON.parse(row.results) as AnalysisResults;
  const session = await buildSession(db, project, parameters.session);
  const current = estimateSession(session, parameters.secr !== null);
  if (parameters.secr && current.secrReason === null) {
    try {
      current.secr = await fitSecrOffThread(
        secrRequestOf(session.inputs, parameters.secr),
        undefined,
        signal,
      );
      current.secrReason = current.secr.reason ?? null;
    } catch (err) {
      if (!(err instanceof ApiError)) throw err;
      current.secrReason = err.message;
    }
  }
  return {
    savedHash: row.freeze_hash,
    currentHash: session.hash,
    changed: session.hash !== row.freeze_hash,
    saved,
    current,
    currentInputs: session.inputs,
    differences: compareRuns(
      { inputs, results: saved },
      { inputs: session.inputs, results: current },
    ),
  };
}
