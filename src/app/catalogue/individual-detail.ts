import type { CatalogueEntry } from '../../../shared/identify';

/** The individual page's data as the server sends it. */
export interface IndividualDetail extends CatalogueEntry {
  requestedAs: string;
  resolvedFromAlias: boolean;
  timeline: {
    sightingId: string;
    eventId: string;
    start: string;
    stationCode: string;
    flank: string;
    quality: string;
    thumbUrl: string;
    photoId: string;
  }[];
  stationsDetected: {
    stationId: string;
    code: string;
    lat: number | null;
    lon: number | null;
    detections: number;
    withheld: boolean;
  }[];
  coordinatePrecision: number | null;
  history: { action: string; at: string; by: string; before: unknown; after: unknown }[];
}
