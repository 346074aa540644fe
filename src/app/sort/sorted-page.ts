import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatOption, MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { SORT_LABELS, type EventView, type SpeciesEntry } from '../../../shared/sort';
import { apiErrorMessage } from '../core/api-error';
import { ProjectStore } from '../core/project-store';
import { SortApi } from './sort-api';
import { SpeciesPicker } from './species-picker';

/** Sorted events: who sorted what; a reviewer can change a label, and the change is recorded. */
@Component({
  selector: 'mac-sorted-page',
  imports: [
    DatePipe,
    FormsModule,
    RouterLink,
    MatButton,
    MatFormField,
    MatLabel,
    MatSelect,
    MatOption,
    SpeciesPicker,
  ],
  templateUrl: './sorted-page.html',
  styles: `
    .events {
      width: 100%;
      border-collapse: collapse;
    }
    .events td,
    .events th {
      padding: 6px 8px;
      border-top: 1px solid var(--mat-sys-outline-variant);
      text-align: left;
    }
    .events img {
      width: 96px;
      height: 64px;
      object-fit: cover;
      border-radius: 4px;
    }
    .overlay {
      position: fixed;
      inset: 0;
      z-index: 1000;
      display: flex;
      align-items: center;
      justify-content: center;
      background: rgb(0 0 0 / 45%);
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SortedPage {
  private readonly api = inject(SortApi);
  private readonly store = inject(ProjectStore);
  protected readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly labels = SORT_LABELS;
  protected readonly labelFilter = signal<string>('');
  protected readonly after = signal<string | null>(null);
  protected readonly page = httpResource<{ items: EventView[]; next: string | null }>(() => {
    const params = new URLSearchParams({ limit: '50' });
    if (this.labelFilter()) params.set('label', this.labelFilter());
    if (this.after()) params.set('after', this.after()!);
    return `/api/projects/${this.slug()}/events?${params.toString()}`;
  });
  protected readonly species = httpResource<SpeciesEntry[]>(
    () => `/api/projects/${this.slug()}/species`,
    { defaultValue: [] },
  );
  protected readonly editing = signal<EventView | null>(null);
  protected readonly error = signal<string | null>(null);

  protected filterBy(label: string): void {
    this.after.set(null);
    this.labelFilter.set(label);
  }

  protected async relabel(event: EventView, label: string, species?: string): Promise<void> {
    try {
      await this.api.label(this.slug(), event.id, {
        label,
        ...(species ? { species } : {}),
        ...(event.label !== null ? { expectedVersion: event.version } : {}),
      });
      this.error.set(null);
      this.page.reload();
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }

  protected async pickSpecies(scientific: string | null): Promise<void> {
    const event = this.editing();
    this.editing.set(null);
    if (event && scientific) await this.relabel(event, 'animal', scientific);
  }
}
