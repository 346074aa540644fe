import { DecimalPipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import type { StationView } from '../../../shared/stations';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { EmptyState } from '../ui/empty-state';
import { StationMap, type MapPoint } from '../ui/station-map';
import { StationImport } from './station-import';
import { StationsApi } from './stations-api';

/** The station grid: map, table with effort, and (for ecologists) adding and importing stations. */
@Component({
  selector: 'mac-stations-page',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    RouterLink,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatButton,
    MatProgressBar,
    StationMap,
    StationImport,
    CautionNote,
    EmptyState,
  ],
  templateUrl: './stations-page.html',
  styleUrl: './stations-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StationsPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(StationsApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  protected readonly project = this.store.current;
  protected readonly canEdit = computed(() => this.store.can('ecologist'));
  protected readonly stations = httpResource<StationView[]>(
    () => `/api/projects/${this.project()?.slug}/stations`,
    {
      defaultValue: [],
    },
  );
  protected readonly points = computed<MapPoint[]>(() =>
    this.stations
      .value()
      .filter((s) => s.lat !== null && s.lon !== null)
      .map((s) => ({ id: s.id, label: `${s.code} ${s.name}`.trim(), lat: s.lat!, lon: s.lon! })),
  );
  protected readonly generalised = computed(
    () =>
      this.stations.value().find((s) => s.coordinatePrecision !== null)?.coordinatePrecision ??
      null,
  );
  protected readonly withheld = computed(() =>
    this.stations.value().some((s) => s.coordinatesWithheld),
  );
  protected readonly totals = computed(() => {
    const list = this.stations.value();
    return {
      cameraDays: list.reduce((sum, s) => sum + s.cameraDays, 0),
      stationDays: list.reduce((sum, s) => sum + s.stationDays, 0),
      deployments: list.reduce((sum, s) => sum + s.deployments, 0),
    };
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly form = inject(NonNullableFormBuilder).group({
    code: ['', [Validators.required, Validators.pattern(/^[A-Za-z0-9][A-Za-z0-9._-]*$/)]],
    name: [''],
    lat: [null as number | null, [Validators.required, Validators.min(-90), Validators.max(90)]],
    lon: [null as number | null, [Validators.required, Validators.min(-180), Validators.max(180)]],
    notes: [''],
  });

  protected openStation(id: string): void {
    void this.router.navigate(['/p', this.project()!.slug, 'stations', id]);
  }

  protected async addStation(): Promise<void> {
    const slug = this.project()?.slug;
    if (!slug || this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    try {
      const v = this.form.getRawValue();
      const station = await this.api.createStation(slug, {
        ...v,
        lat: Number(v.lat),
        lon: Number(v.lon),
      });
      this.form.reset();
      this.stations.reload();
      this.snackBar.open(`Station ${station.code} added.`, undefined, { duration: 3000 });
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
