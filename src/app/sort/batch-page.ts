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
import { MatCheckbox } from '@angular/material/checkbox';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { EventView, SpeciesEntry } from '../../../shared/sort';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { QueueFilters } from './queue-filters';
import { SortApi, type QueueFilter } from './sort-api';
import { SpeciesPicker } from './species-picker';

/** Labels a run of events together (a night of wind-triggered blanks): select, then one label. */
@Component({
  selector: 'mac-batch-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButton,
    MatCheckbox,
    MatProgressBar,
    QueueFilters,
    SpeciesPicker,
  ],
  templateUrl: './batch-page.html',
  styleUrl: './batch-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BatchPage implements OnInit, OnDestroy {
  private readonly api = inject(SortApi);
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly events = signal<EventView[]>([]);
  protected readonly selected = signal<ReadonlySet<string>>(new Set());
  protected readonly filter = signal<QueueFilter>({ order: 'oldest' });
  protected readonly species = signal<SpeciesEntry[]>([]);
  protected readonly picking = signal(false);
  protected readonly busy = signal(false);
  protected readonly message = signal<string | null>(null);
  private lastClicked = -1;

  async ngOnInit(): Promise<void> {
    this.species.set(await this.api.species(this.slug()).catch(() => []));
    await this.load();
  }

  ngOnDestroy(): void {
    void this.api.release(this.slug()).catch(() => undefined);
  }

  protected async applyFilter(filter: QueueFilter): Promise<void> {
    this.filter.set(filter);
    await this.api.release(this.slug()).catch(() => undefined);
    await this.load();
  }

  private async load(): Promise<void> {
    this.busy.set(true);
    try {
      this.events.set((await this.api.next(this.slug(), 50, this.filter())).events);
      this.selected.set(new Set());
      this.lastClicked = -1;
    } catch (err) {
      this.message.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  /** Click toggles one event; Shift+click selects the run from the last clicked one. */
  protected toggle(index: number, event: MouseEvent): void {
    const ids = this.events().map((e) => e.id);
    const next = new Set(this.selected());
    if (event.shiftKey && this.lastClicked >= 0) {
      const [a, b] = [Math.min(index, this.lastClicked), Math.max(index, this.lastClicked)];
      for (let i = a; i <= b; i++) next.add(ids[i]!);
    } else if (next.has(ids[index]!)) next.delete(ids[index]!);
    else next.add(ids[index]!);
    this.lastClicked = index;
    this.selected.set(next);
  }

  protected selectAll(on: boolean): void {
    this.selected.set(on ? new Set(this.events().map((e) => e.id)) : new Set());
  }

  protected async apply(label: string, species?: string): Promise<void> {
    const ids = [...this.selected()];
    if (!ids.length) return;
    this.busy.set(true);
    try {
      const res = await this.api.labelBatch(this.slug(), ids, {
        label,
        ...(species ? { species } : {}),
      });
      const failed = res.results.filter((r) => !r.ok);
      this.message.set(
        `${res.labelled} events labelled${failed.length ? `; ${failed.length} skipped: ${failed[0]!.message}` : '.'}`,
      );
      await this.load();
    } catch (err) {
      this.message.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  protected async pickSpecies(scientific: string | null): Promise<void> {
    this.picking.set(false);
    if (scientific) await this.apply('animal', scientific);
  }
}
