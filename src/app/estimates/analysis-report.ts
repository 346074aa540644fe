import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  ViewEncapsulation,
  computed,
  inject,
  input,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { AnalysisDetail } from '../../../shared/analyses';
import { ProjectStore } from '../core/project-store';
import { describeSession, freezeMessage, localTime } from './analysis-format';
import { SessionOverview } from './session-overview';
import { SessionResults } from './session-results';

/**
 * A saved analysis laid out for paper: browser print (or print to PDF) shows only the report.
 * The station map is left out: exact detection locations of a threatened species travel badly.
 */
@Component({
  selector: 'mac-analysis-report',
  imports: [MatButton, MatProgressBar, RouterLink, SessionOverview, SessionResults],
  templateUrl: './analysis-report.html',
  styleUrl: './analysis-report.scss',
  // Unencapsulated so the print rules can hide the app around the report.
  encapsulation: ViewEncapsulation.None,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnalysisReport {
  /** The analysis id, from the address. */
  readonly id = input.required<string>();
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.slug() ?? '');
  protected readonly project = computed(() => this.store.current());
  protected readonly zone = computed(() => this.store.current()?.timezone ?? 'UTC');
  protected readonly detail = httpResource<AnalysisDetail>(() =>
    this.slug()
      ? `/api/projects/${this.slug()}/analyses/${encodeURIComponent(this.id())}`
      : undefined,
  );
  protected readonly parameters = computed(() => {
    const d = this.detail.value();
    return d ? describeSession(d.parameters.session, this.zone(), d.inputs.stations.length) : [];
  });
  protected readonly freeze = computed(() => {
    const d = this.detail.value();
    if (!d) return '';
    const m = freezeMessage(d.freeze);
    return m
      ? `${m.title}. ${m.text}`
      : 'Rebuilt when this page was opened, the inputs match the data freeze.';
  });
  protected readonly printed = computed(() => {
    const d = this.detail.value();
    return d ? localTime(d.freeze.checkedAt, this.zone()) : '';
  });
  protected readonly saved = computed(() => {
    const d = this.detail.value();
    return d
      ? `${localTime(d.createdAt, this.zone())}${d.createdBy ? ` by ${d.createdBy}` : ''}`
      : '';
  });

  protected print(): void {
    window.print();
  }
}
