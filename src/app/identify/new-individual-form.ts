import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  afterNextRender,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import type { NewIndividual } from './identify-api';

/** Describes a new individual: nickname, sex, marking notes and trait tags (all optional). */
@Component({
  selector: 'mac-new-individual-form',
  imports: [FormsModule, MatButton],
  template: `
    <form
      class="form"
      (ngSubmit)="submit()"
      (keydown.escape)="cancelled.emit()"
      aria-label="New individual"
    >
      <h3>New individual</h3>
      <label
        >Nickname <input #first name="nickname" [(ngModel)]="nickname" autocomplete="off"
      /></label>
      <label>
        Sex
        <select name="sex" [(ngModel)]="sex">
          <option value="unknown">unknown</option>
          <option value="female">female</option>
          <option value="male">male</option>
        </select>
      </label>
      <label
        >Marking notes
        <textarea
          name="notes"
          rows="2"
          [(ngModel)]="notes"
          placeholder="e.g. notched left ear, broken rosette on the shoulder"
        ></textarea>
      </label>
      <label>Trait tags, comma separated <input name="tags" [(ngModel)]="tags" /></label>
      <div class="actions">
        <button mat-flat-button type="submit">Create (Enter)</button>
        <button mat-button type="button" (click)="cancelled.emit()">Cancel (Esc)</button>
      </div>
    </form>
  `,
  styles: `
    .form {
      display: flex;
      flex-direction: column;
      gap: 8px;
      padding: 12px;
      border-radius: 12px;
      background: var(--mat-sys-surface-container-high);
    }
    h3 {
      margin: 0;
      font: var(--mat-sys-title-small);
    }
    label {
      display: flex;
      flex-direction: column;
      gap: 2px;
      font: var(--mat-sys-label-medium);
    }
    input,
    select,
    textarea {
      font: var(--mat-sys-body-medium);
      padding: 6px;
      border-radius: 6px;
      border: 1px solid var(--mat-sys-outline);
      background: var(--mat-sys-surface);
      color: var(--mat-sys-on-surface);
    }
    .actions {
      display: flex;
      gap: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NewIndividualForm {
  readonly created = output<NewIndividual>();
  readonly cancelled = output<void>();
  protected readonly nickname = signal('');
  protected readonly sex = signal<'female' | 'male' | 'unknown'>('unknown');
  protected readonly notes = signal('');
  protected readonly tags = signal('');
  private readonly first = viewChild.required<ElementRef<HTMLInputElement>>('first');

  constructor() {
    afterNextRender(() => this.first().nativeElement.focus());
  }

  protected submit(): void {
    this.created.emit({
      nickname: this.nickname().trim() || null,
      sex: this.sex(),
      notes: this.notes().trim(),
      tags: this.tags()
        .split(',')
        .map((t) => t.trim())
        .filter(Boolean),
    });
  }
}
