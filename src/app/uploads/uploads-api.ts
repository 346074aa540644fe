import { HttpClient, HttpEventType } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { filter, firstValueFrom, map, type Observable } from 'rxjs';
import type { UploadResponse } from '../../../shared/ingest';

/** Progress or the final answer of one upload request. */
export type BatchEvent =
  { kind: 'progress'; loaded: number; total: number } | { kind: 'done'; body: UploadResponse };

/** Card upload requests. */
@Injectable({ providedIn: 'root' })
export class UploadsApi {
  private readonly http = inject(HttpClient);

  /** Sends one batch of files; emits byte progress, then the per-file verdicts. */
  sendBatch(
    slug: string,
    deploymentId: string,
    files: File[],
    uploadId: string | null,
  ): Observable<BatchEvent> {
    const form = new FormData();
    for (const file of files) form.append('photos', file, file.name);
    const params: Record<string, string> = uploadId ? { uploadId } : {};
    return this.http
      .post<UploadResponse>(`/api/projects/${slug}/deployments/${deploymentId}/uploads`, form, {
        params,
        reportProgress: true,
        observe: 'events',
      })
      .pipe(
        filter((e) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
        map((e): BatchEvent => {
          if (e.type === HttpEventType.UploadProgress)
            return { kind: 'progress', loaded: e.loaded, total: e.total ?? 0 };
          return { kind: 'done', body: (e as { body: UploadResponse }).body };
        }),
      );
  }

  /** Queues an upload's failed photos again. */
  retry(slug: string, uploadId: string): Promise<{ requeued: number }> {
    return firstValueFrom(
      this.http.post<{ requeued: number }>(`/api/projects/${slug}/uploads/${uploadId}/retry`, {}),
    );
  }
}
