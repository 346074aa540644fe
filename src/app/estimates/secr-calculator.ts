import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  signal,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { switchMap, takeWhile, timer, type Subscription } from 'rxjs';
import type { SecrRequest } from '../../../shared/estimate';
import type { SecrJobView } from '../../../shared/estimate-api';
import { apiErrorDetails, apiErrorMessage } from '../core/api-error';
import { parseCapturesCsv, parseTrapsCsv, type CaptureRow, type TrapRow } from './estimate-input';
import { EstimatesApi } from './estimates-api';
import { PasteOrUpload } from './paste-or-upload';
import { SecrResults } from './secr-results';

/** How often a running fit is asked for its progress. */
const POLL_MS = 500;

/** Traps and captures → an SECR density fit, run as a server job with a progress bar. */
@Component({
  selector: 'mac-secr-calculator',
  imports: [
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    PasteOrUpload,
    ReactiveFormsModule,
    SecrResults,
  ],
  templateUrl: './secr-calculator.html',
  styleUrl: './calculator.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SecrCalculator {
  private readonly api = inject(EstimatesApi);
  private readonly destroyRef = inject(DestroyRef);
  private polling: Subscription | null = null;
  protected readonly trapsText = signal('');
  protected readonly capturesText = signal('');
  protected readonly form = inject(NonNullableFormBuilder).group({
    detector: ['proximity' as SecrRequest['detector'], Validators.required],
    occasions: ['', [Validators.required, Validators.min(1), Validators.pattern(/^\d+$/)]],
    spacing: ['', Validators.min(0.001)],
    buffer: ['', Validators.min(0.001)],
  });
  protected readonly problems = signal<string[]>([]);
  protected readonly job = signal<SecrJobView | null>(null);
  protected readonly submitted = signal<{ traps: TrapRow[]; captures: CaptureRow[] } | null>(null);
  protected readonly running = computed(() => this.job()?.status === 'running');
  protected readonly percent = computed(() =>
    Math.round(100 * (this.job()?.progress.fraction ?? 0)),
  );

  protected async fit(event: Event): Promise<void> {
    event.preventDefault();
    const request = this.buildRequest();
    if (!request) return;
    this.job.set(null);
    try {
      const { id } = await this.api.startSecrJob(request);
      this.submitted.set({ traps: request.traps, captures: request.captures });
      this.follow(id);
    } catch (err) {
      const details = apiErrorDetails(err);
      this.problems.set(details.length > 0 ? details : [apiErrorMessage(err)]);
    }
  }

  /** Checks the inputs here first, so mistakes are named by line before anything is sent. */
  private buildRequest(): SecrRequest | null {
    const v = this.form.getRawValue();
    const traps = parseTrapsCsv(this.trapsText());
    const captures = parseCapturesCsv(this.capturesText(), new Set(traps.rows.map((t) => t.id)));
    const problems = [...traps.problems, ...captures.problems];
    const occasions = Number(v.occasions);
    const late = captures.rows.find((c) => c.occasion > occasions);
    if (this.form.controls.occasions.valid && late) {
      problems.push(
        `A capture of ${late.animal} is on occasion ${late.occasion}, but there are only ${occasions} occasions.`,
      );
    }
    if ((v.spacing === '') !== (v.buffer === '')) {
      problems.push('Give both the mask spacing and the buffer, or neither (defaults are used).');
    }
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      problems.push('Check the highlighted fields.');
    }
    this.problems.set(problems);
    if (problems.length > 0) return null;
    return {
      traps: traps.rows,
      occasions,
      detector: v.detector,
      captures: captures.rows,
      ...(v.spacing !== '' ? { mask: { spacing: +v.spacing, buffer: +v.buffer } } : {}),
    };
  }

  private follow(id: string): void {
    this.polling?.unsubscribe();
    this.polling = timer(0, POLL_MS)
      .pipe(
        switchMap(() => this.api.secrJob(id)),
        takeWhile((job) => job.status === 'running', true),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (job) => {
          this.job.set(job);
          if (job.status === 'failed') this.problems.set([job.error?.message ?? 'The fit failed.']);
        },
        error: (err: unknown) => this.problems.set([apiErrorMessage(err)]),
      });
  }
}
