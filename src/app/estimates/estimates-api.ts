import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom, type Observable } from 'rxjs';
import type {
  AnalysisDetail,
  AnalysisResults,
  RerunComparison,
  SecrOptions,
  SessionParamsInput,
  SessionPreview,
  SessionTable,
} from '../../../shared/analyses';
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

/** An unsaved run on a session: the session as built and what the models gave. */
export interface SessionRun {
  session: SessionPreview;
  results: AnalysisResults;
}

/** The body of a saved analysis. */
export interface SaveAnalysisBody {
  name: string;
  session: SessionParamsInput;
  secr: SecrOptions | null;
}

/**
 * The estimation API: stateless calculators (no project data), and sessions and saved analyses
 * built from a project's catalogue.
 */
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

  private project(slug: string, path: string): string {
    return `/api/projects/${encodeURIComponent(slug)}${path}`;
  }

  /** Builds a session (effort grid, histories, detections) without running anything. */
  previewSession(slug: string, session: SessionParamsInput): Promise<SessionPreview> {
    return firstValueFrom(
      this.http.post<SessionPreview>(this.project(slug, '/sessions/preview'), session),
    );
  }

  /** Every closed model and the two-step comparison on a session, not saved. */
  runSession(slug: string, session: SessionParamsInput): Promise<SessionRun> {
    return firstValueFrom(
      this.http.post<SessionRun>(this.project(slug, '/sessions/estimate'), { session }),
    );
  }

  /** Starts an SECR fit on a session; follow it with {@link sessionSecrJob}. */
  startSessionSecr(
    slug: string,
    session: SessionParamsInput,
    secr: SecrOptions,
  ): Promise<SecrJobCreated> {
    return firstValueFrom(
      this.http.post<SecrJobCreated>(this.project(slug, '/sessions/secr-jobs'), { session, secr }),
    );
  }

  /** The state of a session's SECR job. */
  sessionSecrJob(slug: string, id: string): Observable<SecrJobView> {
    return this.http.get<SecrJobView>(
      this.project(slug, `/sessions/secr-jobs/${encodeURIComponent(id)}`),
    );
  }

  /** One table of a session as CSV. */
  sessionCsv(slug: string, table: SessionTable, session: SessionParamsInput): Promise<Blob> {
    return firstValueFrom(
      this.http.post(this.project(slug, `/sessions/csv/${table}`), session, {
        responseType: 'blob',
      }),
    );
  }

  /** Runs the models and saves the analysis with its data freeze. */
  saveAnalysis(slug: string, body: SaveAnalysisBody): Promise<AnalysisDetail> {
    return firstValueFrom(this.http.post<AnalysisDetail>(this.project(slug, '/analyses'), body));
  }

  /** The saved analysis beside the same parameters run on today's catalogue. */
  rerunAnalysis(slug: string, id: string): Promise<RerunComparison> {
    return firstValueFrom(
      this.http.post<RerunComparison>(
        this.project(slug, `/analyses/${encodeURIComponent(id)}/rerun`),
        {},
      ),
    );
  }
}
