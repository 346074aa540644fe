import { DatePipe, DecimalPipe } from '@angular/common';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatAnchor } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import type { AnalysisListItem } from '../../../shared/analyses';
import type { ExportPreview } from '../../../shared/exports';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { ExportsApi, type ExportOptions } from './exports-api';

const FEATURE_TEXT: Partial<Record<string, string>> = {
  burrow: 'den or burrow',
  nestSite: 'nest site',
  carcass: 'carcass',
  waterSource: 'water source',
};

/**
 * Sharing the project's data: Camtrap DP packages and Darwin Core occurrences (generalised for the
 * public, or the ecologist's private backup), and spreadsheets. A preview says what each export
 * holds and what it leaves out before anything is downloaded.
 */
@Component({
  selector: 'mac-exports-page',
  imports: [
    FormsModule,
    DecimalPipe,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatRadioGroup,
    MatRadioButton,
    MatCheckbox,
    MatAnchor,
    MatIcon,
    MatProgressBar,
    MatFormField,
    MatLabel,
    MatSelect,
    MatOption,
    DatePipe,
    CautionNote,
  ],
  templateUrl: './exports-page.html',
  styleUrl: './exports-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportsPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(ExportsApi);
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  /** Only the project's ecologists (not admins passing by) may take exact positions out. */
  protected readonly mayExportPrivate = computed(() => this.store.current()?.role === 'ecologist');
  protected readonly profile = signal<'public' | 'private'>('public');
  protected readonly includeSensitiveSites = signal(false);
  protected readonly withMedia = signal(true);
  protected readonly preview = signal<ExportPreview | null>(null);
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly featureText = FEATURE_TEXT;

  protected readonly options = computed<ExportOptions>(() => ({
    profile: this.profile(),
    includeSensitiveSites: this.includeSensitiveSites(),
    media: this.withMedia() ? 'files' : 'none',
  }));
  protected readonly camtrapUrl = computed(() => this.api.camtrapUrl(this.slug(), this.options()));
  protected readonly darwinCoreUrl = computed(() =>
    this.api.darwinCoreUrl(this.slug(), this.options()),
  );
  protected readonly sheets = computed(() =>
    [
      {
        name: 'catalogue',
        title: 'Catalogue',
        text: 'One row per individual: code, sex, sightings, stations, first and last seen, flanks on file.',
      },
      {
        name: 'sightings',
        title: 'Sightings',
        text: 'Every sighting with its event, station, camera, review state, flank and quality.',
      },
    ].map((s) => ({
      ...s,
      csv: this.api.sheetUrl(this.slug(), s.name, 'csv'),
      xlsx: this.api.sheetUrl(this.slug(), s.name, 'xlsx'),
    })),
  );

  protected readonly analyses = signal<AnalysisListItem[]>([]);
  protected readonly analysisId = signal<string>('');
  protected readonly analysisSheets = computed(() => {
    const id = this.analysisId();
    if (!id) return [];
    return [
      { title: 'Capture histories', name: 'histories' },
      { title: 'Effort grid', name: 'effort' },
    ].map((s) => ({
      ...s,
      csv: this.api.sheetUrl(this.slug(), s.name, 'csv', id),
      xlsx: this.api.sheetUrl(this.slug(), s.name, 'xlsx', id),
    }));
  });

  constructor() {
    effect(() => {
      const slug = this.slug();
      if (slug && this.mayExportPrivate()) void this.loadAnalyses(slug);
    });
    effect(() => {
      const slug = this.slug();
      const options = this.options();
      if (slug) void this.load(slug, options);
    });
  }

  private async loadAnalyses(slug: string): Promise<void> {
    try {
      const list = (await this.api.analyses(slug)).filter((a) => a.status === 'done');
      this.analyses.set(list);
      if (list[0] && !this.analysisId()) this.analysisId.set(list[0].id);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }

  private async load(slug: string, options: ExportOptions): Promise<void> {
    this.loading.set(true);
    this.error.set(null);
    try {
      this.preview.set(await this.api.preview(slug, options));
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.loading.set(false);
    }
  }

  protected setProfile(profile: 'public' | 'private'): void {
    this.profile.set(profile);
  }
}
