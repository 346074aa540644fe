import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom, type Observable } from 'rxjs';
import type {
  ClosedRequest,
  PlotsRequest,
  SecrRequest,
  TwoSampleRequest,
} from '../../../shared/estimate';
import type {
  ClosedResponse,
  PlotsResponse,
  SecrJobCreated,
  SecrJobView,
  TwoSampleResponse,
} from '../../../shared/estimate-api';

/** The stateless calculators of the estimation API (no project data). */
@Injectable({ providedIn: 'root' })
export class EstimatesApi {
  private readonly http = inject(HttpClient);

  /** Lincoln–Petersen and Chapman from two samples. */
  twoSample(body: TwoSampleRequest): Promise<TwoSampleResponse> {
    return firstValueFrom(this.http.post<TwoSampleResponse>('/api/estimate/two-sample', body));
  }

  /** Every closed-population model on a set of capture histories. */
  closed(body: ClosedRequest): Promise<ClosedResponse> {
    return firstValueFrom(this.http.post<ClosedResponse>('/api/estimate/closed', body));
  }

  /** Plot (quadrat) count estimate. */
  plots(body: PlotsRequest): Promise<PlotsResponse> {
    return firstValueFrom(this.http.post<PlotsResponse>('/api/estimate/plots', body));
  }

  /** Starts an SECR fit as a job on the server; poll it with {@link secrJob}. */
  startSecrJob(body: SecrRequest): Promise<SecrJobCreated> {
    return firstValueFrom(this.http.post<SecrJobCreated>('/api/estimate/secr/jobs', body));
  }

  /** The state of an SECR job: progress while running, then the result or the error. */
  secrJob(id: string): Observable<SecrJobView> {
    return this.http.get<SecrJobView>(`/api/estimate/secr/jobs/${encodeURIComponent(id)}`);
  }
}
