import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatTabLink, MatTabNav, MatTabNavPanel } from '@angular/material/tabs';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';

/** The Estimates area: calculators first, the project's own data in its own tab. */
@Component({
  selector: 'mac-estimates-layout',
  imports: [MatTabLink, MatTabNav, MatTabNavPanel, RouterLink, RouterLinkActive, RouterOutlet],
  template: `
    <div class="page">
      <h1 class="page-title">Estimates</h1>
      <nav mat-tab-nav-bar [tabPanel]="panel" aria-label="Estimates sections">
        @for (tab of tabs; track tab.path) {
          <a
            mat-tab-link
            [routerLink]="tab.path"
            routerLinkActive
            #active="routerLinkActive"
            [active]="active.isActive"
            [attr.data-testid]="'tab-' + tab.path"
            >{{ tab.label }}</a
          >
        }
      </nav>
      <mat-tab-nav-panel #panel>
        <router-outlet />
      </mat-tab-nav-panel>
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EstimatesLayout {
  protected readonly tabs = [
    { path: 'histories', label: 'Capture histories' },
    { path: 'secr', label: 'SECR density' },
    { path: 'two-samples', label: 'Two samples' },
    { path: 'plots', label: 'Plot counts' },
    { path: 'catalogue', label: "From this project's catalogue" },
    { path: 'analyses', label: 'Saved analyses' },
  ];
}
