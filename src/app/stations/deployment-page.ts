import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { PhotoView } from '../../../shared/ingest';
import type { DeploymentView } from '../../../shared/stations';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { ClockFixPanel } from './clock-fix-panel';
import { DeploymentForm, type DeploymentFormValue } from './deployment-form';
import { StationsApi } from './stations-api';

/** One deployment: its record, the clock fix, and its cards. */
@Component({
  selector: 'mac-deployment-page',
  imports: [
    RouterLink,
    MatButton,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatIcon,
    MatProgressBar,
    DeploymentForm,
    ClockFixPanel,
    CautionNote,
  ],
  template: `
    <div class="page">
      @if (deployment.value(); as d) {
        <a [routerLink]="['../../', d.stationId]">← Station {{ d.stationCode }}</a>
        <header class="head">
          <h1 class="page-title">Camera {{ d.cameraLabel }} at {{ d.stationCode }}</h1>
          <a
            mat-flat-button
            [routerLink]="['/p', slug(), 'uploads', 'new']"
            [queryParams]="{ deploymentId: d.id }"
          >
            <mat-icon>upload</mat-icon>Upload a card
          </a>
        </header>
        <p class="muted">{{ d.photos }} photos · {{ d.cameraDays }} camera-days</p>
        @if (d.featureSensitive) {
          <mac-caution-note icon="location_off">
            This camera watches a sensitive site (den, nest, carcass or water source). It is
            withheld from exports unless the ecologist includes it knowingly.
          </mac-caution-note>
        }
        <mat-card appearance="outlined">
          <mat-card-content>
            <mac-clock-fix-panel
              [slug]="slug()"
              [deployment]="d"
              [photos]="photos.value()"
              (fixed)="afterFix($event)"
            />
          </mat-card-content>
        </mat-card>
        <mat-card appearance="outlined" class="edit">
          <mat-card-header><mat-card-title>Deployment record</mat-card-title></mat-card-header>
          <mat-card-content>
            <mac-deployment-form [initial]="d" [busy]="busy()" (saved)="save($event)" />
            @if (error()) {
              <p class="error" role="alert">{{ error() }}</p>
            }
          </mat-card-content>
        </mat-card>
      } @else if (deployment.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      } @else if (deployment.error()) {
        <p class="error" role="alert">{{ loadError() }}</p>
      }
    </div>
  `,
  styles: `
    .head {
      display: flex;
      justify-content: space-between;
      align-items: center;
      gap: 16px;
    }
    mat-card {
      margin-top: 16px;
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeploymentPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(StationsApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly deploymentId = input.required<string>();
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly deployment = httpResource<DeploymentView>(
    () => `/api/projects/${this.slug()}/deployments/${this.deploymentId()}`,
  );
  protected readonly photos = httpResource<PhotoView[]>(
    () => `/api/projects/${this.slug()}/photos?deploymentId=${this.deploymentId()}&limit=300`,
    { defaultValue: [] },
  );
  protected readonly loadError = computed(() => apiErrorMessage(this.deployment.error()));
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected afterFix(updated: DeploymentView): void {
    this.deployment.set(updated);
    this.photos.reload();
    this.snackBar.open(`Clock fixed: ${updated.photos} photos re-timed.`, undefined, {
      duration: 4000,
    });
  }

  protected async save(value: DeploymentFormValue): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      this.deployment.set(await this.api.updateDeployment(this.slug(), this.deploymentId(), value));
      this.snackBar.open('Deployment saved.', undefined, { duration: 3000 });
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
