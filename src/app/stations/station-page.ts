import { DatePipe, DecimalPipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { DeploymentView, StationView } from '../../../shared/stations';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { DeploymentForm, type DeploymentFormValue } from './deployment-form';
import { StationsApi } from './stations-api';

/** One station: its deployments (cameras over time), effort, and recording a new deployment. */
@Component({
  selector: 'mac-station-page',
  imports: [
    DatePipe,
    DecimalPipe,
    RouterLink,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatIcon,
    MatProgressBar,
    DeploymentForm,
  ],
  template: `
    <div class="page">
      @if (station.value(); as s) {
        <a routerLink="..">← All stations</a>
        <h1 class="page-title">
          Station {{ s.code }} <span class="muted">{{ s.name }}</span>
        </h1>
        <p class="muted">
          {{ s.coordinatesWithheld ? 'Coordinates withheld' : s.lat + ', ' + s.lon }}
          @if (s.coordinatePrecision) {
            (rounded to {{ s.coordinatePrecision }}°)
          }
          · {{ s.cameraDays | number: '1.0-1' }} camera-days ·
          {{ s.stationDays | number: '1.0-1' }} station-days
        </p>
        <table class="table" data-testid="deployments">
          <thead>
            <tr>
              <th>Camera</th>
              <th>Serial</th>
              <th>Start</th>
              <th>End</th>
              <th>Camera-days</th>
              <th>Photos</th>
              <th>Clock</th>
            </tr>
          </thead>
          <tbody>
            @for (d of s.deploymentList; track d.id) {
              <tr>
                <td>
                  <a [routerLink]="['../deployments', d.id]">{{ d.cameraLabel }}</a>
                </td>
                <td>{{ d.cameraSerial ?? '—' }}</td>
                <td>{{ d.start | date: 'medium' : undefined }}</td>
                <td>
                  {{ d.end | date: 'medium' }}
                  @if (d.lastWorking) {
                    <span class="muted">(stopped {{ d.lastWorking | date: 'medium' }})</span>
                  }
                </td>
                <td>{{ d.cameraDays | number: '1.0-1' }}</td>
                <td>{{ d.photos }}</td>
                <td>
                  @if (d.clockFix) {
                    <mat-icon title="Clock fixed" aria-label="Clock fixed">schedule</mat-icon>
                  } @else if (d.clockOffsetSeconds) {
                    offset {{ d.clockOffsetSeconds }} s
                  }
                </td>
              </tr>
            } @empty {
              <tr>
                <td colspan="7" class="muted">No deployment recorded at this station yet.</td>
              </tr>
            }
          </tbody>
        </table>
        <mat-card appearance="outlined">
          <mat-card-header><mat-card-title>Record a deployment</mat-card-title></mat-card-header>
          <mat-card-content>
            <mac-deployment-form
              [defaultZone]="zone()"
              [busy]="busy()"
              submitLabel="Record deployment"
              (saved)="create($event)"
            />
            @if (error()) {
              <p class="error" role="alert">{{ error() }}</p>
            }
          </mat-card-content>
        </mat-card>
      } @else if (station.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      } @else if (station.error()) {
        <p class="error" role="alert">{{ loadError() }}</p>
      }
    </div>
  `,
  styles: `
    .table {
      width: 100%;
      border-collapse: collapse;
      margin: 16px 0 24px;
    }
    .table th {
      text-align: left;
      font: var(--mat-sys-label-large);
      color: var(--mat-sys-on-surface-variant);
      padding: 8px;
    }
    .table td {
      padding: 6px 8px;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StationPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(StationsApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly stationId = input.required<string>();
  protected readonly zone = computed(() => this.store.current()?.timezone ?? 'UTC');
  protected readonly station = httpResource<StationView & { deploymentList: DeploymentView[] }>(
    () => `/api/projects/${this.store.current()?.slug}/stations/${this.stationId()}`,
  );
  protected readonly loadError = computed(() => apiErrorMessage(this.station.error()));
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);

  protected async create(value: DeploymentFormValue): Promise<void> {
    const slug = this.store.current()?.slug;
    if (!slug) return;
    this.busy.set(true);
    this.error.set(null);
    try {
      const d = await this.api.createDeployment(slug, { ...value, stationId: this.stationId() });
      this.station.reload();
      this.snackBar.open(`Deployment of camera ${d.cameraLabel} recorded.`, undefined, {
        duration: 3000,
      });
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
