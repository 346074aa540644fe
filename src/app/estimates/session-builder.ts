import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  effect,
  inject,
  signal,
  untracked,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { Router } from '@angular/router';
import { switchMap, takeWhile, timer, type Subscription } from 'rxjs';
import {
  DEFAULT_CLOSURE_DAYS,
  FLANK_POLICIES,
  FLANK_POLICY_LABELS,
  FLANK_POLICY_RULES,
  SESSION_TABLES,
  type FlankPolicy,
  type SecrOptions,
  type SessionDefaults,
  type SessionParamsInput,
  type SessionPreview,
  type SessionTable,
} from '../../../shared/analyses';
import type { SecrJobView } from '../../../shared/estimate-api';
import type { Quality } from '../../../shared/sort';
import { apiErrorDetails, apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { EstimatesApi, type SessionRun } from './estimates-api';
import { SessionOverview } from './session-overview';
import {
  closureWarning,
  sessionProblems,
  toSessionParams,
  type SessionFormValue,
} from './session-params';
import { SessionResults } from './session-results';

/** How often a running density fit is asked for its progress. */
const POLL_MS = 500;

/** Saves a downloaded file under a name, through a temporary link. */
function saveFile(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/**
 * Estimates from the project's own catalogue: choose a closed session, see its effort grid and
 * capture histories, download them, run the models (SECR as a job with progress) and save.
 */
@Component({
  selector: 'mac-session-builder',
  imports: [
    MatButton,
    MatCheckbox,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
    ReactiveFormsModule,
    SessionOverview,
    SessionResults,
  ],
  templateUrl: './session-builder.html',
  styleUrls: ['./calculator.scss', './session-builder.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SessionBuilder {
  private readonly api = inject(EstimatesApi);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);
  private polling: Subscription | null = null;
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.slug() ?? '');
  protected readonly policies = FLANK_POLICIES.map((p) => ({
    value: p,
    label: FLANK_POLICY_LABELS[p],
    rule: FLANK_POLICY_RULES[p],
  }));
  protected readonly tables = SESSION_TABLES;
  protected readonly defaults = httpResource<SessionDefaults>(() =>
    this.slug() ? `/api/projects/${this.slug()}/sessions/defaults` : undefined,
  );
  protected readonly form = inject(NonNullableFormBuilder).group({
    firstDay: '',
    lastDay: '',
    allStations: true,
    stationIds: [[] as string[]],
    occasionHours: 24,
    flankPolicy: 'left' as FlankPolicy,
    minQuality: 'fair' as Quality,
    closurePeriodDays: DEFAULT_CLOSURE_DAYS,
    fitSecr: false,
    detector: 'proximity' as SecrOptions['detector'],
    name: '',
  });
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.value });
  protected readonly warning = computed(() => {
    this.value();
    return closureWarning(this.formValue());
  });
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal<'preview' | 'run' | 'save' | null>(null);
  protected readonly preview = signal<SessionPreview | null>(null);
  protected readonly run = signal<SessionRun | null>(null);
  protected readonly secrJob = signal<SecrJobView | null>(null);
  /** The parameters the shown session was built with, to notice when the form moves on. */
  private readonly builtWith = signal<string | null>(null);
  protected readonly stale = computed(() => {
    this.value();
    const built = this.builtWith();
    return built !== null && built !== JSON.stringify(this.params());
  });
  protected readonly shownResults = computed(() => {
    const run = this.run();
    const job = this.secrJob();
    if (!run) return null;
    if (!job) return run.results;
    const secr = job.result ?? null;
    const secrReason = job.status === 'failed' ? (job.error?.message ?? 'The fit failed.') : null;
    return { ...run.results, secrRequested: true, secr, secrReason: secr?.reason ?? secrReason };
  });
  protected readonly secrProgress = computed(() => {
    const job = this.secrJob();
    return job?.status === 'running' ? job.progress : null;
  });

  constructor() {
    effect(() => {
      const d = this.defaults.value();
      if (!d) return;
      untracked(() =>
        this.form.patchValue({
          firstDay: d.firstDay ?? '',
          lastDay: d.lastDay ?? '',
          occasionHours: d.occasionHours,
        }),
      );
    });
  }

  private formValue(): SessionFormValue {
    const v = this.form.getRawValue();
    return {
      ...v,
      occasionHours: Number(v.occasionHours),
      closurePeriodDays: Number(v.closurePeriodDays),
    };
  }

  private params(): SessionParamsInput {
    return toSessionParams(this.formValue(), this.defaults.value()?.timezone ?? 'UTC');
  }

  /** The parameters to send, or null after naming what to fix. */
  private checked(): SessionParamsInput | null {
    const problems = sessionProblems(this.formValue());
    this.problems.set(problems);
    return problems.length > 0 ? null : this.params();
  }

  private fail(err: unknown): void {
    const details = apiErrorDetails(err);
    this.problems.set(details.length > 0 ? details : [apiErrorMessage(err)]);
  }

  protected async buildSession(): Promise<void> {
    const params = this.checked();
    if (!params) return;
    this.busy.set('preview');
    try {
      this.preview.set(await this.api.previewSession(this.slug(), params));
      this.run.set(null);
      this.secrJob.set(null);
      this.builtWith.set(JSON.stringify(params));
    } catch (err) {
      this.fail(err);
    } finally {
      this.busy.set(null);
    }
  }

  protected async runModels(): Promise<void> {
    const params = this.checked();
    if (!params) return;
    this.busy.set('run');
    this.secrJob.set(null);
    try {
      const run = await this.api.runSession(this.slug(), params);
      this.preview.set(run.session);
      this.run.set(run);
      this.builtWith.set(JSON.stringify(params));
      if (this.form.controls.fitSecr.value) await this.startSecr(params);
    } catch (err) {
      this.fail(err);
    } finally {
      this.busy.set(null);
    }
  }

  private async startSecr(params: SessionParamsInput): Promise<void> {
    const { id } = await this.api.startSessionSecr(this.slug(), params, this.secrOptions());
    this.polling?.unsubscribe();
    this.polling = timer(0, POLL_MS)
      .pipe(
        switchMap(() => this.api.sessionSecrJob(this.slug(), id)),
        takeWhile((job) => job.status === 'running', true),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (job) => this.secrJob.set(job),
        error: (err: unknown) => this.fail(err),
      });
  }

  private secrOptions(): SecrOptions {
    return { detector: this.form.controls.detector.value };
  }

  protected async download(table: SessionTable): Promise<void> {
    const params = this.checked();
    if (!params) return;
    try {
      saveFile(await this.api.sessionCsv(this.slug(), table, params), `session-${table}.csv`);
    } catch (err) {
      this.fail(err);
    }
  }

  protected async saveAnalysis(): Promise<void> {
    const params = this.checked();
    const name = this.form.controls.name.value.trim();
    if (!params) return;
    if (!name) {
      this.problems.set(['Give the analysis a name before saving it.']);
      return;
    }
    this.busy.set('save');
    try {
      const saved = await this.api.saveAnalysis(this.slug(), {
        name,
        session: params,
        secr: this.form.controls.fitSecr.value ? this.secrOptions() : null,
      });
      await this.router.navigate(['/p', this.slug(), 'estimates', 'analyses', saved.id]);
    } catch (err) {
      this.fail(err);
    } finally {
      this.busy.set(null);
    }
  }
}
