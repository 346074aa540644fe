import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTab, MatTabContent, MatTabGroup } from '@angular/material/tabs';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CurateApi } from './curate-api';
import { DisputesTab } from './disputes-tab';
import { DuplicatesTab } from './duplicates-tab';
import { HistoryTab } from './history-tab';

/** The curator's desk: disputed sightings, possible duplicates, and the history of identity changes. */
@Component({
  selector: 'mac-curate-page',
  imports: [MatTabGroup, MatTab, MatTabContent, MatButton, DisputesTab, DuplicatesTab, HistoryTab],
  template: `
    <div class="page">
      <header class="head">
        <h1 class="page-title">Curate</h1>
        <button mat-stroked-button (click)="digest()">E-mail the curators a digest now</button>
      </header>
      <mat-tab-group>
        <!-- Tab contents load when opened, so each shows the state after work in the others. -->
        <mat-tab label="Disputed sightings"
          ><ng-template matTabContent><mac-disputes-tab [slug]="slug()" /></ng-template
        ></mat-tab>
        <mat-tab label="Possible duplicates"
          ><ng-template matTabContent><mac-duplicates-tab [slug]="slug()" /></ng-template
        ></mat-tab>
        <mat-tab label="Identity changes"
          ><ng-template matTabContent><mac-history-tab [slug]="slug()" /></ng-template
        ></mat-tab>
      </mat-tab-group>
    </div>
  `,
  styles: `
    .head {
      display: flex;
      justify-content: space-between;
      align-items: center;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CuratePage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(CurateApi);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');

  protected async digest(): Promise<void> {
    try {
      const res = await this.api.digest(this.slug());
      this.snackBar.open(
        `Digest sent to ${res.recipients} people: ${res.disputes} disputes, ${res.suggestions} possible duplicates.`,
        'OK',
        { duration: 5000 },
      );
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }
}
