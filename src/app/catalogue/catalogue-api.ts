import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { IndividualDetail } from './individual-detail';

/** Curator writes to individuals. */
@Injectable({ providedIn: 'root' })
export class CatalogueApi {
  private readonly http = inject(HttpClient);

  /** Edits nickname, sex, notes or tags. */
  update(
    slug: string,
    id: string,
    patch: { nickname?: string | null; sex?: string; notes?: string; tags?: string[] },
  ) {
    return firstValueFrom(
      this.http.patch<IndividualDetail>(`/api/projects/${slug}/individuals/${id}`, patch),
    );
  }

  /** Sets the reference photos of a flank. */
  setReferences(slug: string, id: string, flank: 'left' | 'right' | 'other', photoIds: string[]) {
    return firstValueFrom(
      this.http.put<IndividualDetail>(`/api/projects/${slug}/individuals/${id}/references`, {
        flank,
        photoIds,
      }),
    );
  }
}
