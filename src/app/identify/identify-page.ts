import { DatePipe, PercentPipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  inject,
  signal,
  viewChild,
  type OnInit,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSlider, MatSliderThumb } from '@angular/material/slider';
import { RouterLink } from '@angular/router';
import { Subject, debounceTime, distinctUntilChanged, switchMap } from 'rxjs';
import type { Candidate, IdentifyNext, PatternMatchesView } from '../../../shared/identify';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';
import { NO_ZOOM, ZoomPane, type ZoomState } from '../ui/zoom-pane';
import { IdentifyApi, type NewIndividual } from './identify-api';
import { IDENTIFY_HELP, identifyKeyAction, type IdentifyAction } from './identify-keys';
import { NewIndividualForm } from './new-individual-form';
import { PatternMatches } from './pattern-matches';

/** Match a sighting to the catalogue: ranked candidates with reasons, a synchronised compare view, verdict keys. */
@Component({
  selector: 'mac-identify-page',
  imports: [
    DatePipe,
    PercentPipe,
    FormsModule,
    RouterLink,
    MatButton,
    MatProgressBar,
    MatSlider,
    MatSliderThumb,
    EmptyState,
    ZoomPane,
    NewIndividualForm,
    PatternMatches,
  ],
  templateUrl: './identify-page.html',
  styleUrl: './identify-page.scss',
  host: { '(document:keydown)': 'onKey($event)' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class IdentifyPage implements OnInit {
  private readonly api = inject(IdentifyApi);
  private readonly store = inject(ProjectStore);
  private readonly destroyRef = inject(DestroyRef);
  private readonly searchBox = viewChild<ElementRef<HTMLInputElement>>('searchInput');
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly current = signal<IdentifyNext | null>(null);
  protected readonly candidates = signal<Candidate[]>([]);
  protected readonly selected = signal(0);
  protected readonly photoIndex = signal(0);
  protected readonly referenceIndex = signal(0);
  protected readonly zoom = signal<ZoomState>(NO_ZOOM);
  protected readonly mirrored = signal(false);
  protected readonly brightness = signal(1);
  protected readonly contrast = signal(1);
  protected readonly query = signal('');
  protected readonly creating = signal(false);
  protected readonly loading = signal(true);
  protected readonly done = signal(false);
  protected readonly busy = signal(false);
  protected readonly message = signal<string | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly help = IDENTIFY_HELP;
  protected readonly sighting = computed(() => this.current()?.sighting ?? null);
  protected readonly photo = computed(() => {
    const s = this.sighting();
    if (!s) return null;
    return s.photos[this.photoIndex()] ?? s.bestPhoto;
  });
  protected readonly candidate = computed<Candidate | null>(
    () => this.candidates()[this.selected()] ?? null,
  );
  protected readonly reference = computed(() => {
    const refs = this.candidate()?.references ?? [];
    return refs.length ? refs[this.referenceIndex() % refs.length]! : null;
  });
  /** Whether the matched coat points are drawn (P). */
  protected readonly showMatches = signal(false);
  /** Verified point pairs between the sighting and the reference shown, while drawn. */
  protected readonly matches = httpResource<PatternMatchesView>(() => {
    const s = this.sighting();
    const r = this.reference();
    if (!this.showMatches() || !s || !r) return undefined;
    return `/api/projects/${this.slug()}/sightings/${s.id}/pattern-matches/${r.photoId}`;
  });
  protected readonly matchesError = computed(() => {
    const err = this.matches.error();
    return err ? apiErrorMessage(err) : null;
  });
  /** This reviewer's recent calls and how each sighting ended (disputes included). */
  protected readonly myCalls = httpResource<
    {
      callId: string;
      verdict: string;
      calledCode: string | null;
      at: string;
      outcome: string;
      finalCode: string | null;
    }[]
  >(() => (this.slug() ? `/api/projects/${this.slug()}/calls/mine` : undefined), {
    defaultValue: [],
  });
  private readonly queries = new Subject<string>();
  private pending: Promise<void> = Promise.resolve();

  constructor() {
    this.queries
      .pipe(
        debounceTime(250),
        distinctUntilChanged(),
        switchMap((q) => this.api.candidates(this.slug(), this.sighting()!.id, q)),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (list) => {
          this.candidates.set(list);
          this.selected.set(0);
          this.referenceIndex.set(0);
        },
        error: (err: unknown) => this.error.set(apiErrorMessage(err)),
      });
  }

  async ngOnInit(): Promise<void> {
    await this.loadNext();
  }

  private async loadNext(): Promise<void> {
    this.loading.set(true);
    try {
      const next = await this.api.next(this.slug());
      this.current.set(next);
      this.done.set(next === null);
      this.candidates.set(next?.candidates ?? []);
      this.selected.set(0);
      this.photoIndex.set(
        Math.max(
          0,
          next?.sighting.photos.findIndex((p) => p.id === next.sighting.bestPhoto.id) ?? 0,
        ),
      );
      this.referenceIndex.set(0);
      this.zoom.set(NO_ZOOM);
      this.mirrored.set(false);
      this.query.set('');
      this.creating.set(false);
      this.error.set(null);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.loading.set(false);
    }
  }

  protected search(q: string): void {
    this.query.set(q);
    if (this.sighting()) this.queries.next(q.trim());
  }

  protected onKey(event: KeyboardEvent): void {
    const target = event.target as HTMLElement | null;
    if (target?.closest('input, textarea, mat-select, [contenteditable]')) {
      if (event.key === 'Escape') target.blur();
      return;
    }
    if (this.creating() || event.ctrlKey || event.metaKey || event.altKey) return;
    const action = identifyKeyAction(event.key);
    if (!action) return;
    event.preventDefault();
    this.pending = this.pending.then(() => this.perform(action)).catch(() => undefined);
  }

  private async perform(action: IdentifyAction): Promise<void> {
    const count = this.candidates().length;
    const photos = this.sighting()?.photos.length ?? 0;
    switch (action) {
      case 'next-candidate':
        return this.pick(Math.min(count - 1, this.selected() + 1));
      case 'previous-candidate':
        return this.pick(Math.max(0, this.selected() - 1));
      case 'next-photo':
        return this.photoIndex.set(photos ? (this.photoIndex() + 1) % photos : 0);
      case 'previous-photo':
        return this.photoIndex.set(photos ? (this.photoIndex() - 1 + photos) % photos : 0);
      case 'next-reference':
        return this.referenceIndex.update((i) => i + 1);
      case 'match':
        return this.match();
      case 'new':
        return this.creating.set(true);
      case 'unidentifiable':
        return this.verdict('unidentifiable');
      case 'skip':
        return this.skip();
      case 'mirror':
        return this.mirrored.update((m) => !m);
      case 'matched-points':
        return this.showMatches.update((v) => !v);
      case 'zoom-in':
        return this.zoom.update((z) => ({ ...z, scale: Math.min(12, z.scale * 1.25) }));
      case 'zoom-out':
        return this.zoom.update((z) => ({ ...z, scale: Math.max(1, z.scale / 1.25) }));
      case 'zoom-reset':
        return this.zoom.set(NO_ZOOM);
      case 'brighter':
        return this.brightness.update((b) => Math.min(3, b + 0.1));
      case 'darker':
        return this.brightness.update((b) => Math.max(0.3, b - 0.1));
      case 'more-contrast':
        return this.contrast.update((c) => Math.min(3, c + 0.1));
      case 'less-contrast':
        return this.contrast.update((c) => Math.max(0.3, c - 0.1));
      case 'search':
        return this.searchBox()?.nativeElement.focus();
      case 'help':
        return;
    }
  }

  protected pick(index: number): void {
    this.selected.set(Math.max(0, index));
    this.referenceIndex.set(0);
  }

  protected async match(): Promise<void> {
    const c = this.candidate();
    if (!c) {
      this.error.set(
        'There is no candidate to match; press N for a new individual or X if it cannot be identified.',
      );
      return;
    }
    await this.verdict('match', c.individualId, `Matched to ${c.code}.`);
  }

  protected async createNew(individual: NewIndividual): Promise<void> {
    await this.verdict('new', undefined, 'Recorded as a new individual.', individual);
  }

  protected async verdict(
    kind: 'match' | 'new' | 'unidentifiable',
    individualId?: string,
    text?: string,
    individual?: NewIndividual,
  ): Promise<void> {
    const s = this.sighting();
    if (!s || this.busy()) return;
    this.busy.set(true);
    try {
      const result = await this.api.call(this.slug(), s.id, {
        verdict: kind,
        ...(individualId ? { individualId } : {}),
        ...(individual ? { individual } : {}),
      });
      const state = result.sighting.state;
      const code = result.individual?.code;
      this.message.set(
        `${text ?? 'Recorded as unidentifiable.'} The sighting is now ${state}${code && state === 'confirmed' ? ` as ${code}` : ''}.`,
      );
      this.myCalls.reload();
      await this.loadNext();
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  protected async skip(): Promise<void> {
    const s = this.sighting();
    if (!s) return;
    await this.api.skip(this.slug(), s.id).catch(() => undefined);
    this.message.set('Skipped; it stays in the queue for later.');
    await this.loadNext();
  }

  protected setZoom(zoom: ZoomState): void {
    this.zoom.set(zoom);
  }
}
