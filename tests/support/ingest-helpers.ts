import type { TestClient } from './test-app';

/** Creates a station through the API (as an ecologist) and returns its id. */
export async function addStation(
  ecologist: TestClient,
  slug: string,
  code: string,
  lat = -1.2,
  lon = 36.6,
): Promise<string> {
  const res = await ecologist.post(`/api/projects/${slug}/stations`, {
    code,
    name: `Station ${code}`,
    lat,
    lon,
  });
  if (res.status !== 201)
    throw new Error(`station ${code}: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.id as string;
}

/** Records a deployment through the API and returns its id. */
export async function addDeployment(
  client: TestClient,
  slug: string,
  body: {
    stationId: string;
    cameraLabel: string;
    start?: string;
    end?: string;
    timezone?: string;
    cameraSerial?: string;
    clockOffsetSeconds?: number;
  },
): Promise<string> {
  const res = await client.post(`/api/projects/${slug}/deployments`, {
    start: '2026-07-01T06:00:00Z',
    end: '2026-08-30T06:00:00Z',
    timezone: 'Africa/Nairobi',
    ...body,
  });
  if (res.status !== 201) throw new Error(`deployment: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.id as string;
}

/** Uploads files to a deployment (field `photos`), optionally continuing an upload. */
export async function upload(
  client: TestClient,
  slug: string,
  deploymentId: string,
  files: { name: string; body: Buffer }[],
  uploadId?: string,
) {
  let req = client.agent
    .post(
      `/api/projects/${slug}/deployments/${deploymentId}/uploads${uploadId ? `?uploadId=${uploadId}` : ''}`,
    )
    .set('X-XSRF-TOKEN', client.csrf);
  for (const f of files)
    req = req.attach('photos', f.body, { filename: f.name, contentType: 'image/jpeg' });
  return req;
}

/** Polls an upload until every photo is processed (ready or failed). */
export async function waitForUpload(
  client: TestClient,
  slug: string,
  uploadId: string,
  timeoutMs = 60_000,
) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const res = await client.get(`/api/projects/${slug}/uploads/${uploadId}`);
    if (res.status !== 200) throw new Error(`progress: ${res.status} ${JSON.stringify(res.body)}`);
    if (res.body.done) return res.body;
    if (Date.now() > deadline)
      throw new Error(`upload ${uploadId} not done: ${JSON.stringify(res.body.counts)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
