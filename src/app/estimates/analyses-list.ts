import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
  untracked,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import {
  FLANK_POLICY_LABELS,
  type AnalysisListItem,
  type AnalysisPage,
} from '../../../shared/analyses';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';
import { localDay, localTime } from './analysis-format';
import { formatNumber } from './estimate-format';

/** Saved analyses of the project, newest first, with their headline numbers. */
@Component({
  selector: 'mac-analyses-list',
  imports: [EmptyState, MatButton, MatProgressBar, RouterLink],
  template: `
    <h2 class="calc-title">Saved analyses</h2>
    @if (page.isLoading() && items().length === 0) {
      <mat-progress-bar mode="indeterminate" />
    } @else if (page.error()) {
      <p class="problems" role="alert">
        The analyses could not be loaded: {{ page.error()?.message }}
      </p>
    } @else if (items().length === 0) {
      <mac-empty-state
        icon="analytics"
        title="No saved analyses yet"
        message="Build a session from the catalogue, run the models and save it: the analysis keeps its parameters, results and a data freeze."
      >
        <a mat-flat-button [routerLink]="['/p', slug(), 'estimates', 'catalogue']"
          >Build a session</a
        >
      </mac-empty-state>
    } @else {
      <div class="table-scroll">
        <table class="estimates" data-testid="analyses-table">
          <thead>
            <tr>
              <th scope="col">Name</th>
              <th scope="col">Session</th>
              <th scope="col">Flank policy</th>
              <th scope="col" class="num">Individuals</th>
              <th scope="col">N̂ (lowest AICc)</th>
              <th scope="col" class="num">D̂ per 100 km²</th>
              <th scope="col">Saved</th>
            </tr>
          </thead>
          <tbody>
            @for (a of rows(); track a.id) {
              <tr>
                <th scope="row">
                  <a [routerLink]="['/p', slug(), 'estimates', 'analyses', a.id]">{{ a.name }}</a>
                  @if (a.status !== 'done') {
                    <span class="badge">{{ a.status }}</span>
                  }
                </th>
                <td>{{ a.session }}</td>
                <td>{{ a.policy }}</td>
                <td class="num">{{ a.individuals }} × {{ a.occasions }} occ.</td>
                <td>{{ a.best }}</td>
                <td class="num">{{ a.density }}</td>
                <td>{{ a.saved }}</td>
              </tr>
            }
          </tbody>
        </table>
      </div>
      @if (next()) {
        <button mat-button type="button" (click)="after.set(next())">Older analyses</button>
      }
    }
  `,
  styleUrls: ['./calculator.scss', './estimate-results.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnalysesList {
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.slug() ?? '');
  private readonly zone = computed(() => this.store.current()?.timezone ?? 'UTC');
  protected readonly after = signal<string | null>(null);
  protected readonly page = httpResource<AnalysisPage>(() => {
    if (!this.slug()) return undefined;
    const after = this.after();
    return `/api/projects/${this.slug()}/analyses?limit=50${after ? `&after=${encodeURIComponent(after)}` : ''}`;
  });
  protected readonly items = signal<AnalysisListItem[]>([]);
  protected readonly next = computed(() => this.page.value()?.next ?? null);

  constructor() {
    effect(() => {
      const page = this.page.value();
      if (!page) return;
      // Older pages append; the first page replaces.
      const appending = untracked(() => this.after()) !== null;
      this.items.update((list) => (appending ? [...list, ...page.items] : page.items));
    });
  }

  protected readonly rows = computed(() =>
    this.items().map((a) => ({
      id: a.id,
      name: a.name,
      status: a.status,
      session: `${localDay(a.start, this.zone())} – ${localDay(new Date(Date.parse(a.end) - 1).toISOString(), this.zone())}`,
      policy: FLANK_POLICY_LABELS[a.flankPolicy],
      individuals: a.individuals,
      occasions: a.occasions,
      best: a.best ? `${formatNumber(a.best.N)} (${a.best.model})` : '—',
      density: formatNumber(a.densityPer100km2, 2),
      saved: `${localTime(a.createdAt, this.zone())}${a.createdBy ? ` by ${a.createdBy}` : ''}`,
    })),
  );
}
