import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { EventView, SightingView, SpeciesEntry } from '../../../shared/sort';

/** Filters of the sort queue. */
export interface QueueFilter {
  order: 'oldest' | 'station';
  stationId?: string;
  deploymentId?: string;
  from?: string;
  to?: string;
  flag?: string;
}

/** A label to send. */
export interface LabelRequest {
  label: string;
  species?: string;
  count?: number;
  expectedVersion?: number;
}

/** Sighting fields. */
export interface SightingRequest {
  flank: string;
  quality: string;
  bestPhotoId: string;
  crop?: { x: number; y: number; w: number; h: number } | null;
  sex?: string | null;
  ageClass?: string | null;
}

/** Calls of the Sort screen. */
@Injectable({ providedIn: 'root' })
export class SortApi {
  private readonly http = inject(HttpClient);

  /** Leases the next unsorted events. */
  next(slug: string, limit: number, filter: QueueFilter): Promise<{ events: EventView[] }> {
    const params: Record<string, string> = { limit: String(limit), order: filter.order };
    for (const key of ['stationId', 'deploymentId', 'from', 'to', 'flag'] as const) {
      const value = filter[key];
      if (value) params[key] = value;
    }
    return firstValueFrom(
      this.http.get<{ events: EventView[] }>(`/api/projects/${slug}/sort/next`, { params }),
    );
  }

  /** Gives back this reviewer's leases. */
  release(slug: string): Promise<unknown> {
    return firstValueFrom(this.http.post(`/api/projects/${slug}/sort/release`, {}));
  }

  /** Labels one event. */
  label(slug: string, eventId: string, body: LabelRequest): Promise<EventView> {
    return firstValueFrom(
      this.http.post<EventView>(`/api/projects/${slug}/events/${eventId}/label`, body),
    );
  }

  /** Labels many events. */
  labelBatch(slug: string, eventIds: string[], body: LabelRequest) {
    return firstValueFrom(
      this.http.post<{
        labelled: number;
        results: { id: string; ok: boolean; message?: string }[];
      }>(`/api/projects/${slug}/events/label-batch`, { eventIds, ...body }),
    );
  }

  /** The project's quick-pick species. */
  species(slug: string): Promise<SpeciesEntry[]> {
    return firstValueFrom(this.http.get<SpeciesEntry[]>(`/api/projects/${slug}/species`));
  }

  /** Records a sighting. */
  createSighting(slug: string, eventId: string, body: SightingRequest): Promise<SightingView> {
    return firstValueFrom(
      this.http.post<SightingView>(`/api/projects/${slug}/events/${eventId}/sightings`, body),
    );
  }

  /** Removes an open sighting. */
  deleteSighting(slug: string, sightingId: string): Promise<unknown> {
    return firstValueFrom(this.http.delete(`/api/projects/${slug}/sightings/${sightingId}`));
  }

  /** Unblurs a photo of people for this session (logged on the server). */
  reveal(photoId: string): Promise<unknown> {
    return firstValueFrom(this.http.post(`/api/photos/${photoId}/reveal`, {}));
  }
}
