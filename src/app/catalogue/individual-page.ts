import { DatePipe, JsonPipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { CautionNote } from '../ui/caution-note';
import { StationMap, type MapPoint } from '../ui/station-map';
import { CurateApi } from '../curate/curate-api';
import { CatalogueApi } from './catalogue-api';
import type { IndividualDetail } from './individual-detail';

/** One individual: reference photos per flank, every confirmed sighting, where it was seen, and its history. */
@Component({
  selector: 'mac-individual-page',
  imports: [
    DatePipe,
    JsonPipe,
    FormsModule,
    RouterLink,
    MatButton,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatProgressBar,
    StationMap,
    CautionNote,
  ],
  templateUrl: './individual-page.html',
  styleUrl: './individual-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IndividualPage {
  private readonly store = inject(ProjectStore);
  private readonly api = inject(CatalogueApi);
  private readonly snackBar = inject(MatSnackBar);
  readonly idOrCode = input.required<string>();
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly canCurate = computed(() => this.store.can('curator'));
  protected readonly detail = httpResource<IndividualDetail>(
    () => `/api/projects/${this.slug()}/individuals/${this.idOrCode()}`,
  );
  protected readonly error = computed(() =>
    this.detail.error() ? apiErrorMessage(this.detail.error()) : null,
  );
  protected readonly points = computed<MapPoint[]>(() => {
    const d = this.detail.value();
    if (!d) return [];
    const max = Math.max(1, ...d.stationsDetected.map((s) => s.detections));
    return d.stationsDetected
      .filter((s) => s.lat !== null && s.lon !== null)
      .map((s) => ({
        id: s.stationId,
        label: `${s.code}: ${s.detections} detection(s)`,
        lat: s.lat!,
        lon: s.lon!,
        weight: s.detections / max,
        highlight: true,
      }));
  });
  protected readonly tileUrl = computed(() => this.store.current()?.tileUrl ?? null);
  protected readonly flanks = ['left', 'right', 'other'] as const;
  private readonly curate = inject(CurateApi);
  protected readonly chosen = signal<ReadonlySet<string>>(new Set());
  protected readonly changeReason = signal('');
  protected readonly targetCode = signal('');
  protected readonly editing = signal(false);
  protected readonly nickname = signal('');
  protected readonly sex = signal('unknown');
  protected readonly notes = signal('');
  protected readonly tags = signal('');

  constructor() {
    effect(() => {
      const d = this.detail.value();
      if (!d) return;
      this.nickname.set(d.nickname ?? '');
      this.sex.set(d.sex);
      this.notes.set(d.notes);
      this.tags.set(d.tags.join(', '));
    });
  }

  protected refs(flank: string) {
    return this.detail.value()?.references.filter((r) => r.flank === flank) ?? [];
  }

  protected async save(): Promise<void> {
    const d = this.detail.value();
    if (!d) return;
    try {
      const updated = await this.api.update(this.slug(), d.id, {
        nickname: this.nickname().trim() || null,
        sex: this.sex(),
        notes: this.notes().trim(),
        tags: this.tags()
          .split(',')
          .map((t) => t.trim())
          .filter(Boolean),
      });
      this.detail.set(updated);
      this.editing.set(false);
      this.snackBar.open('Saved.', undefined, { duration: 2500 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  /** Makes a photo the first reference of a flank (curators). */
  protected async useAsReference(
    photoId: string,
    flank: 'left' | 'right' | 'other',
  ): Promise<void> {
    const d = this.detail.value();
    if (!d) return;
    const current = this.refs(flank)
      .map((r) => r.photoId)
      .filter((id) => id !== photoId);
    try {
      this.detail.set(
        await this.api.setReferences(this.slug(), d.id, flank, [photoId, ...current].slice(0, 12)),
      );
      this.snackBar.open(`Reference photo for the ${flank} flank set.`, undefined, {
        duration: 2500,
      });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  protected async removeReference(
    photoId: string,
    flank: 'left' | 'right' | 'other',
  ): Promise<void> {
    const d = this.detail.value();
    if (!d) return;
    const keep = this.refs(flank)
      .map((r) => r.photoId)
      .filter((id) => id !== photoId);
    this.detail.set(await this.api.setReferences(this.slug(), d.id, flank, keep));
  }

  protected toggleChosen(sightingId: string): void {
    const next = new Set(this.chosen());
    if (next.has(sightingId)) next.delete(sightingId);
    else next.add(sightingId);
    this.chosen.set(next);
  }

  private reason(): string | null {
    const r = this.changeReason().trim();
    if (r.length >= 3) return r;
    this.snackBar.open('Give a reason (a few words); it stays in the history.', 'OK', {
      duration: 5000,
    });
    return null;
  }

  /** Moves the chosen sightings to a new individual, or to the one named by the code typed. */
  protected async split(): Promise<void> {
    const d = this.detail.value();
    const reason = this.reason();
    if (!d || !reason || this.chosen().size === 0) return;
    try {
      const into = this.targetCode().trim()
        ? await this.curate.resolveCode(this.slug(), this.targetCode())
        : undefined;
      const res = await this.curate.split(this.slug(), d.id, [...this.chosen()], reason, into);
      this.snackBar.open(res.change.summary, 'OK', { duration: 5000 });
      this.chosen.set(new Set());
      this.detail.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  /** Merges this individual into the one named by the code typed. */
  protected async mergeInto(): Promise<void> {
    const d = this.detail.value();
    const reason = this.reason();
    if (!d || !reason || !this.targetCode().trim()) return;
    try {
      const into = await this.curate.resolveCode(this.slug(), this.targetCode());
      const res = await this.curate.merge(this.slug(), d.id, into, reason);
      this.snackBar.open(res.change.summary, 'OK', { duration: 5000 });
      this.detail.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }
}
