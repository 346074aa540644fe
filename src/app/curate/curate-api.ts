import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { IdentityChangeView } from '../../../shared/curate';

/** The curator's writes: decisions, merges, splits, undo, dismissals, the digest. */
@Injectable({ providedIn: 'root' })
export class CurateApi {
  private readonly http = inject(HttpClient);

  /** Decides a disputed sighting. */
  resolve(
    slug: string,
    sightingId: string,
    body: { verdict: string; individualId?: string; reason: string },
  ) {
    return firstValueFrom(
      this.http.post<{ change: IdentityChangeView }>(
        `/api/projects/${slug}/sightings/${sightingId}/resolve`,
        body,
      ),
    );
  }

  /** Merges one individual into another. */
  merge(slug: string, fromId: string, into: string, reason: string) {
    return firstValueFrom(
      this.http.post<{ change: IdentityChangeView }>(
        `/api/projects/${slug}/individuals/${fromId}/merge`,
        { into, reason },
      ),
    );
  }

  /** Moves chosen sightings to a new individual, or to an existing one. */
  split(slug: string, fromId: string, sightingIds: string[], reason: string, into?: string) {
    return firstValueFrom(
      this.http.post<{ change: IdentityChangeView }>(
        `/api/projects/${slug}/individuals/${fromId}/split`,
        {
          sightingIds,
          reason,
          ...(into ? { into } : {}),
        },
      ),
    );
  }

  /** Undoes an identity change. */
  undo(slug: string, changeId: string, reason: string) {
    return firstValueFrom(
      this.http.post<{ change: IdentityChangeView }>(
        `/api/projects/${slug}/identity-changes/${changeId}/undo`,
        { reason },
      ),
    );
  }

  /** Says two individuals are different animals. */
  dismiss(slug: string, first: string, second: string, reason: string) {
    return firstValueFrom(
      this.http.post(`/api/projects/${slug}/duplicates/dismiss`, { first, second, reason }),
    );
  }

  /** Sends the digest e-mail to the project's curators now. */
  digest(slug: string) {
    return firstValueFrom(
      this.http.post<{ recipients: number; disputes: number; suggestions: number }>(
        `/api/projects/${slug}/curate/digest`,
        {},
      ),
    );
  }

  /** The id of an individual named by a code or alias. */
  async resolveCode(slug: string, code: string): Promise<string> {
    const found = await firstValueFrom(
      this.http.get<{ id: string }>(
        `/api/projects/${slug}/individuals/${encodeURIComponent(code.trim())}`,
      ),
    );
    return found.id;
  }
}
