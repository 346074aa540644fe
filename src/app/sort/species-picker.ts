import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  afterNextRender,
  computed,
  input,
  output,
  signal,
  viewChild,
} from '@angular/core';
import type { SpeciesEntry } from '../../../shared/sort';
import { SpeciesSearch, type SpeciesOption } from './species-search';

/** Picks an animal's species: 1–9 from the project's quick list, or type to search every species. */
@Component({
  selector: 'mac-species-picker',
  template: `
    <div class="picker" role="dialog" aria-label="Which species?" (keydown)="onKey($event)">
      <input
        #box
        type="search"
        placeholder="Type a name, or press 1–9"
        [value]="query()"
        (input)="query.set(box.value)"
        aria-label="Search species"
        data-testid="species-search"
      />
      <ol class="options">
        @for (s of options(); track s.scientific; let i = $index) {
          <li [class.active]="i === active()">
            <button type="button" (click)="picked.emit(s.scientific)">
              <kbd>{{ i + 1 }}</kbd> {{ s.common }} <em>{{ s.scientific }}</em>
            </button>
          </li>
        } @empty {
          <li class="muted">No species matches “{{ query() }}”.</li>
        }
      </ol>
      <p class="muted">Enter picks the highlighted one · Esc cancels</p>
    </div>
  `,
  styles: `
    .picker {
      background: var(--mat-sys-surface-container-high);
      border-radius: 12px;
      padding: 12px;
      box-shadow: var(--mat-sys-level3);
      width: 360px;
    }
    input {
      width: 100%;
      box-sizing: border-box;
      padding: 8px;
      font: inherit;
      border-radius: 8px;
      border: 1px solid var(--mat-sys-outline);
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
    }
    .options {
      list-style: none;
      padding: 0;
      margin: 8px 0;
    }
    button {
      width: 100%;
      text-align: left;
      border: 0;
      background: none;
      padding: 6px 8px;
      border-radius: 6px;
      font: inherit;
      color: inherit;
      cursor: pointer;
    }
    li.active button {
      background: var(--mat-sys-secondary-container);
    }
    kbd {
      display: inline-block;
      min-width: 1.4em;
      text-align: center;
      border: 1px solid var(--mat-sys-outline);
      border-radius: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SpeciesPicker {
  readonly projectSpecies = input<SpeciesEntry[]>([]);
  readonly picked = output<string | null>();
  protected readonly query = signal('');
  protected readonly active = signal(0);
  private readonly box = viewChild.required<ElementRef<HTMLInputElement>>('box');
  private readonly search = computed(() => new SpeciesSearch(this.projectSpecies()));
  protected readonly options = computed<SpeciesOption[]>(() => {
    const q = this.query();
    return q.trim() ? this.search().find(q, 9) : this.projectSpecies().slice(0, 9);
  });

  constructor() {
    afterNextRender(() => this.box().nativeElement.focus());
  }

  protected onKey(event: KeyboardEvent): void {
    const options = this.options();
    if (event.key === 'Escape') {
      event.preventDefault();
      this.picked.emit(null);
    } else if (event.key === 'Enter') {
      event.preventDefault();
      const choice = options[this.active()];
      if (choice) this.picked.emit(choice.scientific);
    } else if (event.key === 'ArrowDown' || event.key === 'ArrowUp') {
      event.preventDefault();
      const step = event.key === 'ArrowDown' ? 1 : -1;
      this.active.set((this.active() + step + options.length) % Math.max(1, options.length));
    } else if (/^[1-9]$/.test(event.key) && !this.query()) {
      event.preventDefault();
      const choice = options[Number(event.key) - 1];
      if (choice) this.picked.emit(choice.scientific);
    } else {
      this.active.set(0);
    }
  }
}
