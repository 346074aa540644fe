import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterLink } from '@angular/router';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';

/** Where estimates from the project's own catalogue will live; says honestly what it needs. */
@Component({
  selector: 'mac-catalogue-estimates',
  imports: [EmptyState, RouterLink],
  template: `
    <h2 class="visually-hidden">From this project's catalogue</h2>
    <mac-empty-state
      icon="pending"
      title="Needs confirmed sightings"
      message="Estimates from this project's own data are built from confirmed sightings of catalogued individuals and from the stations' deployments. That work (sessions, effort grid, capture histories from the catalogue, saved analyses and reports) is not in this version of Maculo yet."
      data-testid="catalogue-empty"
    >
      @if (slug(); as s) {
        <p>
          Until then, the calculators take histories, traps and captures you paste or upload — start
          with <a [routerLink]="['/p', s, 'estimates', 'histories']">capture histories</a>.
        </p>
      }
    </mac-empty-state>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CatalogueEstimates {
  protected readonly slug = inject(ProjectStore).slug;
}
