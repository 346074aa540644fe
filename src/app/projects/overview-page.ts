import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { MatButton } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { ROLE_LABELS } from '../../../shared/roles';
import { navFor } from '../core/navigation';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { AbundanceIndexView, type AbundanceIndex } from './abundance-index';
import { ProgressChart, type StationProgress } from './progress-chart';

/** A project's front page: what it is, its settings, where to go next, and the cautions. */
@Component({
  selector: 'mac-overview-page',
  imports: [
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatIcon,
    MatButton,
    RouterLink,
    CautionNote,
    ProgressChart,
    AbundanceIndexView,
  ],
  templateUrl: './overview-page.html',
  styleUrl: './overview-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OverviewPage {
  private readonly store = inject(ProjectStore);
  protected readonly project = this.store.current;
  protected readonly roleLabel = computed(() => {
    const role = this.project()?.role;
    return role ? ROLE_LABELS[role] : 'Administrator';
  });
  protected readonly places = computed(() =>
    navFor(this.project()?.role ?? null).filter((item) => item.path !== 'overview'),
  );
  protected readonly canEditSettings = computed(() => this.store.can('ecologist'));
  protected readonly progress = httpResource<{
    photos: { total: number; ready: number; failed: number; waiting: number };
    events: { total: number; sorted: number; byLabel: Record<string, number> };
    sightings: Record<string, number>;
    byStation: StationProgress[];
  }>(() => `/api/projects/${this.project()?.slug}/progress`);
  protected readonly index = httpResource<AbundanceIndex>(
    () => `/api/projects/${this.project()?.slug}/relative-abundance`,
  );
  protected readonly precisionText = computed(() => {
    const p = this.project();
    if (!p) return '';
    if (p.sensitivity === 'none')
      return 'not sensitive: exact coordinates are shown to every member';
    if (p.publicPrecision === null)
      return 'extreme: coordinates are withheld below the ecologist role and in exports';
    return `${p.sensitivity}: coordinates are rounded to ${p.publicPrecision}° below the ecologist role and in exports`;
  });
}
