import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type {
  CreateDeploymentBody,
  DeploymentView,
  StationImportReport,
  StationView,
  UpdateDeploymentBody,
} from '../../../shared/stations';

/** Writes for stations and deployments. */
@Injectable({ providedIn: 'root' })
export class StationsApi {
  private readonly http = inject(HttpClient);

  /** Creates a station. */
  createStation(
    slug: string,
    body: { code: string; name: string; lat: number; lon: number; notes: string },
  ) {
    return firstValueFrom(this.http.post<StationView>(`/api/projects/${slug}/stations`, body));
  }

  /** Edits a station. */
  updateStation(
    slug: string,
    id: string,
    patch: Partial<{ code: string; name: string; lat: number; lon: number; notes: string }>,
  ) {
    return firstValueFrom(
      this.http.patch<StationView>(`/api/projects/${slug}/stations/${id}`, patch),
    );
  }

  /** Imports stations from CSV text (or checks it when dryRun). */
  importCsv(slug: string, csv: string, dryRun: boolean) {
    const params = dryRun ? { dryRun: '1' } : undefined;
    return firstValueFrom(
      this.http.post<StationImportReport>(
        `/api/projects/${slug}/stations/import`,
        { csv },
        { params },
      ),
    );
  }

  /** Records a deployment. */
  createDeployment(slug: string, body: Partial<CreateDeploymentBody>) {
    return firstValueFrom(
      this.http.post<DeploymentView>(`/api/projects/${slug}/deployments`, body),
    );
  }

  /** Edits a deployment. */
  updateDeployment(slug: string, id: string, patch: UpdateDeploymentBody) {
    return firstValueFrom(
      this.http.patch<DeploymentView>(`/api/projects/${slug}/deployments/${id}`, patch),
    );
  }

  /** Applies a clock fix from a reference photo. */
  clockFix(slug: string, id: string, photoId: string, trueTime: string) {
    return firstValueFrom(
      this.http.post<DeploymentView>(`/api/projects/${slug}/deployments/${id}/clock-fix`, {
        photoId,
        trueTime,
      }),
    );
  }
}
