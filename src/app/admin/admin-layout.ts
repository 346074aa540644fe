import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatTabLink, MatTabNav, MatTabNavPanel } from '@angular/material/tabs';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';

/** Administration: users, projects, memberships, backup and import, and the local outbox. */
@Component({
  selector: 'mac-admin-layout',
  imports: [MatTabNav, MatTabLink, MatTabNavPanel, RouterLink, RouterLinkActive, RouterOutlet],
  template: `
    <div class="page">
      <h1 class="page-title">Administration</h1>
      <nav mat-tab-nav-bar [tabPanel]="panel" aria-label="Administration sections">
        @for (link of links; track link.path) {
          <a
            mat-tab-link
            [routerLink]="link.path"
            routerLinkActive
            #rla="routerLinkActive"
            [active]="rla.isActive"
          >
            {{ link.label }}
          </a>
        }
      </nav>
      <mat-tab-nav-panel #panel><router-outlet /></mat-tab-nav-panel>
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AdminLayout {
  protected readonly links = [
    { path: 'users', label: 'Users' },
    { path: 'projects', label: 'Projects' },
    { path: 'memberships', label: 'Memberships' },
    { path: 'data', label: 'Backup and import' },
    { path: 'outbox', label: 'Outbox' },
  ];
}
