import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AnalysisListItem } from '../../../shared/analyses';
import type { ExportPreview } from '../../../shared/exports';

/** The options of an export, as the page holds them. */
export interface ExportOptions {
  profile: 'public' | 'private';
  includeSensitiveSites: boolean;
  media: 'files' | 'none';
}

function query(options: Partial<ExportOptions>): string {
  let params = new HttpParams();
  if (options.profile === 'private') params = params.set('profile', 'private');
  if (options.includeSensitiveSites) params = params.set('includeSensitiveSites', 'true');
  if (options.media === 'none') params = params.set('media', 'none');
  const text = params.toString();
  return text ? `?${text}` : '';
}

/** Export previews, and the addresses the browser downloads the files from. */
@Injectable({ providedIn: 'root' })
export class ExportsApi {
  private readonly http = inject(HttpClient);

  /** What an export with these options will hold and leave out. */
  preview(slug: string, options: ExportOptions): Promise<ExportPreview> {
    const { media: _media, ...rest } = options;
    return firstValueFrom(
      this.http.get<ExportPreview>(`/api/projects/${slug}/exports/preview${query(rest)}`),
    );
  }

  camtrapUrl(slug: string, options: ExportOptions): string {
    return `/api/projects/${slug}/exports/camtrap-dp${query(options)}`;
  }

  darwinCoreUrl(slug: string, options: ExportOptions): string {
    const { media: _media, ...rest } = options;
    return `/api/projects/${slug}/exports/dwc${query(rest)}`;
  }

  sheetUrl(slug: string, sheet: string, format: 'csv' | 'xlsx', analysisId?: string): string {
    const query = analysisId ? `?analysisId=${analysisId}` : '';
    return `/api/projects/${slug}/exports/sheets/${sheet}.${format}${query}`;
  }

  /** Saved analyses (newest first), whose frozen histories and effort grids can be downloaded. */
  async analyses(slug: string): Promise<AnalysisListItem[]> {
    const page = await firstValueFrom(
      this.http.get<{ items: AnalysisListItem[] }>(`/api/projects/${slug}/analyses?limit=100`),
    );
    return page.items;
  }
}
