import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import {
  SESSION_TABLES,
  type AnalysisDetail,
  type RerunComparison,
} from '../../../shared/analyses';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { describeSession, freezeMessage, localTime } from './analysis-format';
import { EstimatesApi } from './estimates-api';
import { RerunComparisonView } from './rerun-comparison';
import { SessionOverview } from './session-overview';
import { SessionResults } from './session-results';

/** How often a saved analysis whose density fit is still running is read again. */
const POLL_MS = 1000;

/** One saved analysis: parameters, frozen inputs, results, whether the catalogue has changed since. */
@Component({
  selector: 'mac-analysis-page',
  imports: [
    MatButton,
    MatIcon,
    MatProgressBar,
    RerunComparisonView,
    RouterLink,
    SessionOverview,
    SessionResults,
  ],
  templateUrl: './analysis-page.html',
  styleUrls: ['./calculator.scss', './analysis-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnalysisPage {
  /** The analysis id, from the address. */
  readonly id = input.required<string>();
  private readonly store = inject(ProjectStore);
  private readonly api = inject(EstimatesApi);
  protected readonly slug = computed(() => this.store.slug() ?? '');
  protected readonly zone = computed(() => this.store.current()?.timezone ?? 'UTC');
  protected readonly tables = SESSION_TABLES;
  protected readonly detail = httpResource<AnalysisDetail>(() =>
    this.slug()
      ? `/api/projects/${this.slug()}/analyses/${encodeURIComponent(this.id())}`
      : undefined,
  );
  protected readonly comparison = signal<RerunComparison | null>(null);
  protected readonly rerunning = signal(false);
  protected readonly rerunError = signal<string | null>(null);

  protected readonly banner = computed(() => {
    const d = this.detail.value();
    return d ? freezeMessage(d.freeze) : null;
  });
  protected readonly parameters = computed(() => {
    const d = this.detail.value();
    return d ? describeSession(d.parameters.session, this.zone(), d.inputs.stations.length) : [];
  });
  protected readonly saved = computed(() => {
    const d = this.detail.value();
    if (!d) return '';
    return `${localTime(d.createdAt, this.zone())}${d.createdBy ? ` by ${d.createdBy}` : ''}`;
  });

  constructor() {
    effect((onCleanup) => {
      if (this.detail.value()?.status !== 'running') return;
      const timer = setTimeout(() => this.detail.reload(), POLL_MS);
      onCleanup(() => clearTimeout(timer));
    });
  }

  protected csvUrl(table: string): string {
    return `/api/projects/${this.slug()}/analyses/${encodeURIComponent(this.id())}/csv/${table}`;
  }

  protected async rerun(): Promise<void> {
    this.rerunning.set(true);
    this.rerunError.set(null);
    try {
      this.comparison.set(await this.api.rerunAnalysis(this.slug(), this.id()));
    } catch (err) {
      this.rerunError.set(apiErrorMessage(err));
    } finally {
      this.rerunning.set(false);
    }
  }
}
