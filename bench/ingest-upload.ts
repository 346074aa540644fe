/**
 * The client side of the ingest benchmark: sends a card in batches the way the upload page does,
 * checks through the API that every photo is sortable, and waits until every preview is made.
 */
import { openAsBlob } from 'node:fs';
import { basename } from 'node:path';
import { arrayField, isRecord, stringField, type ApiSession } from './api-session';

/** One upload request and its outcome. */
export interface BatchTiming {
  files: number;
  ms: number;
  accepted: number;
  rejected: number;
  duplicate: number;
}

/** The whole card as sent. */
export interface UploadRun {
  uploadId: string;
  batches: BatchTiming[];
  /** From the first byte sent to the last batch's answer. */
  ms: number;
}

function countStatus(files: unknown[], status: string): number {
  return files.filter((f) => isRecord(f) && f['status'] === status).length;
}

/**
 * Sends the files to `POST /api/projects/:slug/deployments/:id/uploads` in batches of `batchSize`,
 * one request after the other (as the browser does), continuing one card upload with `?uploadId=`.
 */
export async function uploadCard(
  session: ApiSession,
  slug: string,
  deploymentId: string,
  paths: string[],
  batchSize: number,
  onBatch?: (done: number) => void,
): Promise<UploadRun> {
  const started = performance.now();
  const batches: BatchTiming[] = [];
  let uploadId: string | null = null;
  for (let first = 0; first < paths.length; first += batchSize) {
    const form = new FormData();
    for (const path of paths.slice(first, first + batchSize)) {
      form.append('photos', await openAsBlob(path, { type: 'image/jpeg' }), basename(path));
    }
    const query = uploadId ? `?uploadId=${uploadId}` : '';
    const t0 = performance.now();
    const res = await session.request(
      `/api/projects/${slug}/deployments/${deploymentId}/uploads${query}`,
      { method: 'POST', body: form },
    );
    const body: unknown = await res.json();
    const ms = performance.now() - t0;
    if (res.status !== 201) throw new Error(`upload: ${res.status} ${JSON.stringify(body)}`);
    uploadId = stringField(isRecord(body) ? body['upload'] : null, 'id');
    const files = arrayField(body, 'files');
    batches.push({
      files: files.length,
      ms,
      accepted: countStatus(files, 'accepted'),
      rejected: countStatus(files, 'rejected'),
      duplicate: countStatus(files, 'duplicate'),
    });
    onBatch?.(Math.min(paths.length, first + batchSize));
  }
  if (!uploadId) throw new Error('nothing was uploaded');
  return { uploadId, batches, ms: performance.now() - started };
}

/** What the API showed right after the last batch was answered. */
export interface SortableCheck {
  photos: number;
  withCaptureTime: number;
  inEvents: number;
  events: number;
  thumbsServed: number;
  /** Thumbnails answered with the camera's embedded EXIF thumbnail (the worker's was not made yet). */
  exifThumbs: number;
  ms: number;
}

async function listAll(session: ApiSession, path: string, key: 'photos' | 'events') {
  const items: unknown[] = [];
  let after: string | null = null;
  for (;;) {
    const sep = path.includes('?') ? '&' : '?';
    const page = await session.getJson(
      `${path}${after ? `${sep}after=${encodeURIComponent(after)}` : ''}`,
    );
    if (key === 'photos') {
      if (!Array.isArray(page.body)) throw new Error('photo list is not an array');
      items.push(...(page.body as unknown[]));
      after = page.headers.get('x-next-cursor');
    } else {
      items.push(...arrayField(page.body, 'items'));
      const next = isRecord(page.body) ? page.body['next'] : null;
      after = typeof next === 'string' ? next : null;
    }
    if (!after) return items;
  }
}

/**
 * Checks that every photo of the upload has its capture time, belongs to an event in the Sort
 * listing and has a thumbnail the grid can show (the embedded EXIF one counts).
 */
export async function checkSortable(
  session: ApiSession,
  slug: string,
  uploadId: string,
): Promise<SortableCheck> {
  const started = performance.now();
  const photos = await listAll(
    session,
    `/api/projects/${slug}/photos?uploadId=${uploadId}&limit=5000`,
    'photos',
  );
  const events = await listAll(
    session,
    `/api/projects/${slug}/events?label=unclassified&limit=200`,
    'events',
  );
  const inEvents = new Set<string>();
  for (const e of events)
    for (const p of arrayField(e, 'photos')) inEvents.add(stringField(p, 'id'));
  const ids = photos.map((p) => stringField(p, 'id'));
  let thumbsServed = 0;
  let exifThumbs = 0;
  for (const id of ids) {
    const res = await session.request(`/api/photos/${id}/thumb`);
    await res.arrayBuffer();
    if (res.status !== 200) continue;
    thumbsServed++;
    if (res.headers.get('etag')?.endsWith('-e"')) exifThumbs++;
  }
  return {
    photos: ids.length,
    withCaptureTime: photos.filter((p) => isRecord(p) && typeof p['takenAt'] === 'string').length,
    inEvents: ids.filter((id) => inEvents.has(id)).length,
    events: events.length,
    thumbsServed,
    exifThumbs,
    ms: performance.now() - started,
  };
}

/** Processing counts as the upload page polls them. */
export interface ProcessingDone {
  counts: Record<string, number>;
  polls: number;
}

/** Polls `GET /api/projects/:slug/uploads/:id` until `done` (every preview and thumbnail made). */
export async function waitProcessed(
  session: ApiSession,
  slug: string,
  uploadId: string,
  pollMs: number,
  timeoutMs: number,
): Promise<ProcessingDone> {
  const deadline = Date.now() + timeoutMs;
  for (let polls = 1; ; polls++) {
    const { body } = await session.getJson(`/api/projects/${slug}/uploads/${uploadId}`);
    const counts = isRecord(body) && isRecord(body['counts']) ? body['counts'] : {};
    if (isRecord(body) && body['done'] === true) {
      return {
        counts: Object.fromEntries(Object.entries(counts).map(([k, v]) => [k, Number(v)])),
        polls,
      };
    }
    if (Date.now() > deadline) throw new Error(`not processed in time: ${JSON.stringify(counts)}`);
    await new Promise((r) => setTimeout(r, pollMs));
  }
}
