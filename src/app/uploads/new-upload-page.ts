import { DecimalPipe } from '@angular/common';
import { HttpClient, httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
  signal,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { ScrollingModule } from '@angular/cdk/scrolling';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { lastValueFrom, switchMap, takeWhile, tap, timer } from 'rxjs';
import type { UploadProgress } from '../../../shared/ingest';
import type { DeploymentView } from '../../../shared/stations';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { filesFromDrop, isCardClutter } from './dropped-files';
import { fileProgress, planBatches } from './upload-batches';
import { UploadsApi } from './uploads-api';

/** One file of the card on its way up. */
interface FileRow {
  id: number;
  file: File;
  name: string;
  size: number;
  progress: number;
  status: 'waiting' | 'sending' | 'accepted' | 'duplicate' | 'rejected' | 'error';
  message: string | null;
}

/** Uploading a card: choose the deployment, drop files or a folder, watch progress, read the verdicts. */
@Component({
  selector: 'mac-new-upload-page',
  imports: [
    DecimalPipe,
    FormsModule,
    RouterLink,
    ScrollingModule,
    MatFormField,
    MatLabel,
    MatSelect,
    MatOption,
    MatButton,
    MatIcon,
    MatProgressBar,
  ],
  templateUrl: './new-upload-page.html',
  styleUrl: './new-upload-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NewUploadPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(UploadsApi);
  private readonly http = inject(HttpClient);
  private readonly destroyRef = inject(DestroyRef);
  readonly deploymentId = input<string>();
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly deployments = httpResource<DeploymentView[]>(
    () => `/api/projects/${this.slug()}/deployments`,
    { defaultValue: [] },
  );
  protected readonly chosen = signal<string | null>(null);
  protected readonly target = computed(() => this.chosen() ?? this.deploymentId() ?? null);
  protected readonly rows = signal<FileRow[]>([]);
  protected readonly phase = signal<'choose' | 'sending' | 'processing' | 'done'>('choose');
  protected readonly sentBytes = signal(0);
  protected readonly uploadId = signal<string | null>(null);
  protected readonly processing = signal<UploadProgress | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly dragging = signal(false);
  protected readonly totalBytes = computed(() => this.rows().reduce((s, r) => s + r.size, 0));
  protected readonly overall = computed(() =>
    this.totalBytes() ? (100 * this.sentBytes()) / this.totalBytes() : 0,
  );
  protected readonly tally = computed(() => {
    const count = (status: FileRow['status']) =>
      this.rows().filter((r) => r.status === status).length;
    return {
      accepted: count('accepted'),
      duplicate: count('duplicate'),
      rejected: count('rejected'),
      error: count('error'),
    };
  });
  protected readonly problems = computed(() =>
    this.rows().filter((r) => r.status === 'rejected' || r.status === 'error'),
  );
  protected readonly processed = computed(() => {
    const p = this.processing();
    if (!p) return 0;
    const accepted = p.counts.accepted || 1;
    return (100 * (p.counts.ready + p.counts.failed)) / accepted;
  });

  protected onDragOver(event: DragEvent): void {
    event.preventDefault();
    this.dragging.set(true);
  }

  protected async onDrop(event: DragEvent): Promise<void> {
    event.preventDefault();
    this.dragging.set(false);
    if (event.dataTransfer) this.addFiles(await filesFromDrop(event.dataTransfer));
  }

  protected pick(event: Event): void {
    const input = event.target as HTMLInputElement;
    this.addFiles(Array.from(input.files ?? []));
    input.value = '';
  }

  protected clear(): void {
    this.rows.set([]);
  }

  private addFiles(files: File[]): void {
    const start = this.rows().length;
    const added = files
      .filter((f) => !isCardClutter(f.name))
      .map((file, i): FileRow => ({
        id: start + i,
        file,
        name: file.name,
        size: file.size,
        progress: 0,
        status: 'waiting',
        message: null,
      }));
    this.rows.update((rows) => [...rows, ...added]);
  }

  private patch(ids: Set<number>, change: (row: FileRow, index: number) => Partial<FileRow>): void {
    let index = 0;
    this.rows.update((rows) =>
      rows.map((r) => (ids.has(r.id) ? { ...r, ...change(r, index++) } : r)),
    );
  }

  protected async start(): Promise<void> {
    const deploymentId = this.target();
    if (!deploymentId || this.rows().length === 0) return;
    this.phase.set('sending');
    this.error.set(null);
    let sentBefore = 0;
    for (const batch of planBatches(this.rows(), 25, 64_000_000)) {
      const ids = new Set(batch.files.map((f) => f.id));
      const sizes = batch.files.map((f) => f.size);
      this.patch(ids, () => ({ status: 'sending' }));
      try {
        const events$ = this.api
          .sendBatch(
            this.slug(),
            deploymentId,
            batch.files.map((f) => f.file),
            this.uploadId(),
          )
          .pipe(
            tap((event) => {
              if (event.kind === 'progress') {
                const share = event.total ? event.loaded / event.total : 0;
                const each = fileProgress(sizes, share * batch.bytes);
                this.sentBytes.set(sentBefore + share * batch.bytes);
                this.patch(ids, (_r, i) => ({ progress: each[i] ?? 0 }));
              } else {
                this.uploadId.set(event.body.upload.id);
                const verdicts = event.body.files;
                this.patch(ids, (_r, i) => ({
                  progress: 1,
                  status: verdicts[i]?.status ?? 'error',
                  message: verdicts[i]?.message ?? null,
                }));
              }
            }),
          );
        await lastValueFrom(events$);
      } catch (err) {
        this.patch(ids, () => ({ status: 'error', message: apiErrorMessage(err) }));
        this.error.set(
          `A batch failed: ${apiErrorMessage(err)} The other batches go on; send the failed files again.`,
        );
      }
      sentBefore += batch.bytes;
      this.sentBytes.set(sentBefore);
    }
    this.watchProcessing();
  }

  private watchProcessing(): void {
    const id = this.uploadId();
    if (!id) {
      this.phase.set('done');
      return;
    }
    this.phase.set('processing');
    timer(0, 1000)
      .pipe(
        switchMap(() =>
          this.http.get<UploadProgress>(`/api/projects/${this.slug()}/uploads/${id}`),
        ),
        takeWhile((p) => !p.done, true),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (p) => {
          this.processing.set(p);
          if (p.done) this.phase.set('done');
        },
        error: (err: unknown) => this.error.set(apiErrorMessage(err)),
      });
  }

  protected readonly trackRow = (_index: number, row: FileRow) => row.id;

  protected describe(d: DeploymentView): string {
    return `${d.stationCode} · camera ${d.cameraLabel} · ${d.start.slice(0, 10)} → ${d.end.slice(0, 10)}`;
  }
}
