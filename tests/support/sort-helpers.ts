import { addDeployment, addStation, upload, waitForUpload } from './ingest-helpers';
import { exifJpeg } from './photo-fixtures';
import type { TestClient } from './test-app';

/**
 * Uploads one synthetic photo per event time (camera local time, Africa/Nairobi) to a new station,
 * so each time becomes its own event (they are hours apart). Returns the station id and upload id.
 */
export async function stationWithEvents(
  ecologist: TestClient,
  uploader: TestClient,
  slug: string,
  code: string,
  times: string[],
): Promise<{ stationId: string; deploymentId: string; uploadId: string }> {
  const stationId = await addStation(ecologist, slug, code);
  const deploymentId = await addDeployment(uploader, slug, { stationId, cameraLabel: 'A' });
  const files = [];
  for (const [i, time] of times.entries()) {
    files.push({
      name: `${code}_${i}.jpg`,
      body: await exifJpeg(
        { dateTimeOriginal: time },
        { color: (0x30405000 + code.charCodeAt(2) * 0x10000 + i * 0x100 + 0xff) >>> 0 },
      ),
    });
  }
  const res = await upload(uploader, slug, deploymentId, files);
  if (res.status !== 201)
    throw new Error(`upload failed: ${res.status} ${JSON.stringify(res.body)}`);
  await waitForUpload(uploader, slug, res.body.upload.id);
  return { stationId, deploymentId, uploadId: res.body.upload.id };
}

/** `count` EXIF times one hour apart from 2026-07-02 00:00 local. */
export function hourly(count: number, day = 2): string[] {
  return Array.from(
    { length: count },
    (_, i) => `2026:07:${String(day).padStart(2, '0')} ${String(i).padStart(2, '0')}:00:00`,
  );
}
