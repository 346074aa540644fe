import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { FLAG_TEXT, PHOTO_FLAGS } from '../../../shared/ingest';
import type { DeploymentView, StationView } from '../../../shared/stations';
import type { QueueFilter } from './sort-api';

/** Narrows the sort queue: order, station, deployment, dates and photo flags. */
@Component({
  selector: 'mac-queue-filters',
  imports: [FormsModule, MatFormField, MatLabel, MatSelect, MatOption, MatInput, MatButton],
  template: `
    <form class="filters" (ngSubmit)="apply()">
      <mat-form-field>
        <mat-label>Order</mat-label>
        <mat-select [(ngModel)]="order" name="order">
          <mat-option value="oldest">Oldest first</mat-option>
          <mat-option value="station">By station</mat-option>
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Station</mat-label>
        <mat-select [(ngModel)]="stationId" name="station">
          <mat-option [value]="''">All</mat-option>
          @for (s of stations.value(); track s.id) {
            <mat-option [value]="s.id">{{ s.code }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>Camera</mat-label>
        <mat-select [(ngModel)]="deploymentId" name="deployment">
          <mat-option [value]="''">All</mat-option>
          @for (d of deployments.value(); track d.id) {
            <mat-option [value]="d.id">{{ d.stationCode }} · {{ d.cameraLabel }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field>
        <mat-label>From</mat-label>
        <input matInput type="date" [(ngModel)]="from" name="from" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Until</mat-label>
        <input matInput type="date" [(ngModel)]="to" name="to" />
      </mat-form-field>
      <mat-form-field>
        <mat-label>Flag</mat-label>
        <mat-select [(ngModel)]="flag" name="flag">
          <mat-option [value]="''">Any</mat-option>
          @for (f of flags; track f) {
            <mat-option [value]="f">{{ flagText[f] }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <button mat-stroked-button type="submit">Apply</button>
    </form>
  `,
  styles: `
    .filters {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
    }
    mat-form-field {
      width: 150px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QueueFilters {
  readonly slug = input.required<string>();
  readonly changed = output<QueueFilter>();
  protected readonly flags = PHOTO_FLAGS;
  protected readonly flagText = FLAG_TEXT;
  protected readonly stations = httpResource<StationView[]>(
    () => `/api/projects/${this.slug()}/stations`,
    { defaultValue: [] },
  );
  protected readonly deployments = httpResource<DeploymentView[]>(
    () => `/api/projects/${this.slug()}/deployments`,
    { defaultValue: [] },
  );
  protected readonly order = signal<'oldest' | 'station'>('oldest');
  protected readonly stationId = signal('');
  protected readonly deploymentId = signal('');
  protected readonly from = signal('');
  protected readonly to = signal('');
  protected readonly flag = signal('');

  protected apply(): void {
    const filter: QueueFilter = { order: this.order() };
    if (this.stationId()) filter.stationId = this.stationId();
    if (this.deploymentId()) filter.deploymentId = this.deploymentId();
    if (this.from()) filter.from = new Date(`${this.from()}T00:00:00Z`).toISOString();
    if (this.to()) filter.to = new Date(`${this.to()}T23:59:59Z`).toISOString();
    if (this.flag()) filter.flag = this.flag();
    this.changed.emit(filter);
  }
}
