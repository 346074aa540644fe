import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom, map, type Observable } from 'rxjs';
import type { CallResult, Candidate, IdentifyNext } from '../../../shared/identify';

/** A new individual as a reviewer describes it. */
export interface NewIndividual {
  nickname: string | null;
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
}

/** Calls of the Identify screen. */
@Injectable({ providedIn: 'root' })
export class IdentifyApi {
  private readonly http = inject(HttpClient);

  /** The next sighting for this reviewer (leased), or null when nothing is left. */
  next(slug: string): Promise<IdentifyNext | null> {
    return firstValueFrom(
      this.http
        .get<IdentifyNext>(`/api/projects/${slug}/identify/next`, { observe: 'response' })
        .pipe(map((res) => (res.status === 204 ? null : res.body))),
    );
  }

  /** Candidates re-ranked with what the reviewer typed. */
  candidates(slug: string, sightingId: string, q: string): Observable<Candidate[]> {
    return this.http.get<Candidate[]>(`/api/projects/${slug}/sightings/${sightingId}/candidates`, {
      params: q ? { q } : {},
    });
  }

  /** Records this reviewer's call. */
  call(
    slug: string,
    sightingId: string,
    body: {
      verdict: 'match' | 'new' | 'unidentifiable';
      individualId?: string;
      individual?: NewIndividual;
      note?: string;
    },
  ): Promise<CallResult> {
    return firstValueFrom(
      this.http.post<CallResult>(`/api/projects/${slug}/sightings/${sightingId}/calls`, body),
    );
  }

  /** Puts a sighting back and moves on. */
  skip(slug: string, sightingId: string): Promise<unknown> {
    return firstValueFrom(this.http.post(`/api/projects/${slug}/identify/skip`, { sightingId }));
  }
}
