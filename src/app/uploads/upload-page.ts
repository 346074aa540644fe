import { DatePipe } from '@angular/common';
import { HttpClient, httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  input,
  signal,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatChipListbox, MatChipOption } from '@angular/material/chips';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { switchMap, takeWhile, timer } from 'rxjs';
import {
  FLAG_TEXT,
  type PhotoFlag,
  type PhotoView,
  type UploadFileView,
  type UploadProgress,
} from '../../../shared/ingest';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { UploadsApi } from './uploads-api';

/** One card: counts, live processing, flags to check, rejected files with reasons, and the photos. */
@Component({
  selector: 'mac-upload-page',
  imports: [DatePipe, RouterLink, MatButton, MatChipListbox, MatChipOption, MatProgressBar],
  templateUrl: './upload-page.html',
  styleUrl: './upload-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UploadPage {
  private readonly store = inject(ProjectStore);
  private readonly http = inject(HttpClient);
  private readonly api = inject(UploadsApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);
  readonly uploadId = input.required<string>();
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly progress = signal<UploadProgress | null>(null);
  protected readonly flag = signal<PhotoFlag | null>(null);
  protected readonly flagText = FLAG_TEXT;
  protected readonly files = httpResource<UploadFileView[]>(
    () => `/api/projects/${this.slug()}/uploads/${this.uploadId()}/files`,
    {
      defaultValue: [],
    },
  );
  protected readonly photos = httpResource<PhotoView[]>(
    () =>
      `/api/projects/${this.slug()}/photos?uploadId=${this.uploadId()}&limit=2000${this.flag() ? `&flag=${this.flag()}` : ''}`,
    { defaultValue: [] },
  );
  protected readonly rejected = computed(() =>
    this.files.value().filter((f) => f.status === 'rejected'),
  );
  protected readonly flags = computed(
    () => Object.entries(this.progress()?.flagged ?? {}) as [PhotoFlag, number][],
  );
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => {
      const id = this.uploadId();
      const slug = this.slug();
      if (!slug) return;
      timer(0, 1500)
        .pipe(
          switchMap(() => this.http.get<UploadProgress>(`/api/projects/${slug}/uploads/${id}`)),
          takeWhile((p) => !p.done, true),
          takeUntilDestroyed(this.destroyRef),
        )
        .subscribe({
          next: (p) => {
            const wasDone = this.progress()?.done;
            this.progress.set(p);
            if (p.done && wasDone === false) this.photos.reload();
          },
          error: (err: unknown) => this.error.set(apiErrorMessage(err)),
        });
    });
  }

  protected pickFlag(flag: PhotoFlag | null): void {
    this.flag.set(flag);
  }

  protected async retry(): Promise<void> {
    try {
      const { requeued } = await this.api.retry(this.slug(), this.uploadId());
      this.snackBar.open(`${requeued} photos queued again.`, undefined, { duration: 3000 });
      this.progress.update((p) => (p ? { ...p, done: false } : p));
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  protected flagLabels(p: PhotoView): string {
    return p.flags.map((f) => FLAG_TEXT[f]).join('; ');
  }
}
