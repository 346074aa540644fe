import { DatePipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  signal,
  type OnDestroy,
  type OnInit,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { EventView, Flank, Quality, SpeciesEntry } from '../../../shared/sort';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';
import { ZoomPane } from '../ui/zoom-pane';
import { CropBox, type CropRect } from './crop-box';
import { QueueFilters } from './queue-filters';
import { SortApi, type QueueFilter } from './sort-api';
import { KEY_HELP, sortKeyAction, type SortAction, type SortMode } from './sort-keys';
import { SpeciesPicker } from './species-picker';

/** One animal being described before it is saved as a sighting. */
interface SightingDraft {
  flank: Flank | null;
  quality: Quality | null;
  bestPhotoId: string | null;
  crop: CropRect | null;
  saved: boolean;
}

/** The last label given, so Z can take it back exactly. */
interface UndoEntry {
  eventId: string;
  before: { label: string | null; species: string | null; count: number | null };
  version: number;
}

const BATCH = 20;

/** Keyboard-first triage: one key per label, the event's photos at a glance, sightings for the target species. */
@Component({
  selector: 'mac-sort-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButton,
    MatProgressBar,
    EmptyState,
    ZoomPane,
    SpeciesPicker,
    CropBox,
    QueueFilters,
  ],
  templateUrl: './sort-page.html',
  styleUrl: './sort-page.scss',
  host: { '(document:keydown)': 'onKey($event)' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SortPage implements OnInit, OnDestroy {
  private readonly api = inject(SortApi);
  private readonly store = inject(ProjectStore);
  protected readonly project = this.store.current;
  protected readonly slug = computed(() => this.project()?.slug ?? '');
  protected readonly queue = signal<EventView[]>([]);
  protected readonly index = signal(0);
  protected readonly photoIndex = signal(0);
  protected readonly mode = signal<SortMode>('label');
  protected readonly picking = signal(false);
  protected readonly viewing = signal(false);
  protected readonly showHelp = signal(true);
  protected readonly pendingCount = signal(1);
  protected readonly drafts = signal<SightingDraft[]>([]);
  protected readonly draftIndex = signal(0);
  protected readonly species = signal<SpeciesEntry[]>([]);
  protected readonly filter = signal<QueueFilter>({ order: 'oldest' });
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly done = signal(0);
  protected readonly undoStack = signal<UndoEntry[]>([]);
  protected readonly keyHelp = KEY_HELP;
  protected readonly event = computed<EventView | null>(() => this.queue()[this.index()] ?? null);
  protected readonly photo = computed<EventView['photos'][number] | null>(
    () => this.event()?.photos[this.photoIndex()] ?? null,
  );
  protected readonly draft = computed<SightingDraft | null>(
    () => this.drafts()[this.draftIndex()] ?? null,
  );
  protected readonly target = computed(() => this.species().find((s) => s.target) ?? null);
  private pending: Promise<void> = Promise.resolve();

  async ngOnInit(): Promise<void> {
    this.species.set(await this.api.species(this.slug()).catch(() => []));
    await this.refill(true);
  }

  ngOnDestroy(): void {
    void this.api.release(this.slug()).catch(() => undefined);
  }

  protected async applyFilter(filter: QueueFilter): Promise<void> {
    this.filter.set(filter);
    await this.api.release(this.slug()).catch(() => undefined);
    await this.refill(true);
  }

  /** Tops the queue up (new leases) when few events are left. */
  private async refill(reset = false): Promise<void> {
    this.loading.set(true);
    try {
      const { events } = await this.api.next(this.slug(), BATCH, this.filter());
      if (reset) {
        this.queue.set(events);
        this.index.set(0);
      } else {
        const have = new Set(this.queue().map((e) => e.id));
        this.queue.update((q) => [...q, ...events.filter((e) => !have.has(e.id))]);
      }
      this.photoIndex.set(0);
      this.error.set(null);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.loading.set(false);
    }
  }

  protected onKey(event: KeyboardEvent): void {
    const target = event.target as HTMLElement | null;
    if (this.picking() || target?.closest('input, textarea, mat-select, [contenteditable]')) return;
    const action = sortKeyAction(event.key, this.mode(), event.ctrlKey || event.metaKey);
    if (action.kind === 'none') return;
    event.preventDefault();
    // Keys are handled one after another, so a fast typist's labels land on the right events.
    this.pending = this.pending.then(() => this.perform(action)).catch(() => undefined);
  }

  private async perform(action: SortAction): Promise<void> {
    switch (action.kind) {
      case 'label':
        return this.label(action.label);
      case 'target': {
        const t = this.target();
        return t ? this.label('animal', t.scientific) : undefined;
      }
      case 'pick-species':
        return this.picking.set(true);
      case 'count':
        return this.pendingCount.set(action.count);
      case 'photo':
        return this.movePhoto(action.step);
      case 'event':
        return this.moveEvent(action.step);
      case 'undo':
        return this.undo();
      case 'view':
        return this.viewing.set(!this.viewing());
      case 'close':
        if (this.viewing()) return this.viewing.set(false);
        if (this.mode() === 'sighting') return this.finishSightings();
        return;
      case 'help':
        return this.showHelp.update((v) => !v);
      case 'flank':
        return this.patchDraft({ flank: action.flank });
      case 'quality':
        return this.patchDraft({ quality: action.quality });
      case 'best-photo':
        return this.patchDraft({ bestPhotoId: this.photo()?.id ?? null });
      case 'save-sighting':
        return this.saveSighting();
    }
  }

  protected movePhoto(step: number): void {
    const count = this.event()?.photos.length ?? 0;
    if (count) this.photoIndex.set((this.photoIndex() + step + count) % count);
  }

  protected moveEvent(step: number): void {
    const next = this.index() + step;
    if (next < 0) return;
    this.index.set(Math.min(next, this.queue().length));
    this.photoIndex.set(0);
    if (this.queue().length - this.index() < 5) void this.refill();
  }

  /** Labels the current event; a target-species label opens the sighting editor. */
  protected async label(label: string, species?: string): Promise<void> {
    const event = this.event();
    if (!event || this.mode() === 'sighting') return;
    const count = label === 'animal' ? this.pendingCount() : undefined;
    try {
      const updated = await this.api.label(this.slug(), event.id, {
        label,
        ...(species ? { species } : {}),
        ...(count ? { count } : {}),
        ...(event.label !== null ? { expectedVersion: event.version } : {}),
      });
      this.undoStack.update((s) => [
        ...s.slice(-49),
        {
          eventId: event.id,
          before: { label: event.label, species: event.species, count: event.count },
          version: updated.version,
        },
      ]);
      this.queue.update((q) => q.map((e) => (e.id === updated.id ? updated : e)));
      this.pendingCount.set(1);
      this.done.update((n) => n + 1);
      this.error.set(null);
      if (label === 'animal' && species === this.target()?.scientific)
        return this.openSightings(updated);
      this.moveEvent(1);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }

  protected async pickSpecies(scientific: string | null): Promise<void> {
    this.picking.set(false);
    if (scientific) await this.label('animal', scientific);
  }

  /** Takes back the last label exactly (the server checks nobody changed it since). */
  protected async undo(): Promise<void> {
    const last = this.undoStack().at(-1);
    if (!last) return;
    const before = last.before;
    try {
      const restored = await this.api.label(this.slug(), last.eventId, {
        label: before.label ?? 'unclassified',
        ...(before.species ? { species: before.species } : {}),
        ...(before.label === 'animal' && before.count ? { count: before.count } : {}),
        expectedVersion: last.version,
      });
      this.undoStack.update((s) => s.slice(0, -1));
      this.queue.update((q) => q.map((e) => (e.id === restored.id ? restored : e)));
      const at = this.queue().findIndex((e) => e.id === restored.id);
      if (at >= 0) this.index.set(at);
      this.mode.set('label');
      this.done.update((n) => Math.max(0, n - 1));
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }

  private openSightings(event: EventView): void {
    const existing = event.sightings.length;
    const needed = Math.max(0, (event.count ?? 1) - existing);
    if (needed === 0) return this.moveEvent(1);
    this.drafts.set(
      Array.from({ length: needed }, () => ({
        flank: null,
        quality: null,
        bestPhotoId: this.photo()?.id ?? null,
        crop: null,
        saved: false,
      })),
    );
    this.draftIndex.set(0);
    this.mode.set('sighting');
  }

  protected patchDraft(patch: Partial<SightingDraft>): void {
    const i = this.draftIndex();
    this.drafts.update((list) => list.map((d, j) => (j === i ? { ...d, ...patch } : d)));
  }

  protected setCrop(crop: CropRect | null): void {
    if (this.mode() === 'sighting')
      this.patchDraft({ crop, bestPhotoId: this.photo()?.id ?? null });
  }

  protected async saveSighting(): Promise<void> {
    const event = this.event();
    const draft = this.draft();
    if (!event || !draft) return;
    if (!draft.flank || !draft.quality) {
      this.error.set('Choose a flank (L, R, O, F, K, U) and a quality (G, A, P) first.');
      return;
    }
    try {
      const saved = await this.api.createSighting(this.slug(), event.id, {
        flank: draft.flank,
        quality: draft.quality,
        bestPhotoId: draft.bestPhotoId ?? event.photos[0]!.id,
        crop: draft.crop,
      });
      this.queue.update((q) =>
        q.map((e) => (e.id === event.id ? { ...e, sightings: [...e.sightings, saved] } : e)),
      );
      this.patchDraft({ saved: true });
      this.error.set(null);
      if (this.draftIndex() + 1 < this.drafts().length) this.draftIndex.update((i) => i + 1);
      else this.finishSightings();
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }

  private finishSightings(): void {
    this.mode.set('label');
    this.drafts.set([]);
    this.moveEvent(1);
  }

  protected async reveal(photoId: string): Promise<void> {
    await this.api.reveal(photoId);
    this.queue.update((q) =>
      q.map((e) => ({
        ...e,
        photos: e.photos.map((p) =>
          p.id === photoId
            ? {
                ...p,
                blurred: false,
                previewUrl: `${p.previewUrl}?r=1`,
                thumbUrl: `${p.thumbUrl}?r=1`,
              }
            : p,
        ),
      })),
    );
  }
}
