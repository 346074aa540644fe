import { ChangeDetectionStrategy, Component, input, model, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';

/** Largest file read into a text box (the server takes request bodies up to 1 MB). */
const MAX_FILE_BYTES = 1024 * 1024;

/** A text box for pasted data with a button that fills it from a CSV or text file instead. */
@Component({
  selector: 'mac-paste-or-upload',
  imports: [MatButton, MatFormField, MatHint, MatIcon, MatInput, MatLabel],
  template: `
    <mat-form-field class="box">
      <mat-label>{{ label() }}</mat-label>
      <textarea
        matInput
        spellcheck="false"
        [rows]="rows()"
        [value]="text()"
        [attr.data-testid]="testId()"
        (input)="updateText($event)"
      ></textarea>
      <mat-hint>{{ hint() }}</mat-hint>
    </mat-form-field>
    <div class="file">
      <input
        #file
        type="file"
        class="visually-hidden"
        tabindex="-1"
        aria-hidden="true"
        accept=".csv,.txt,.tsv,text/csv,text/plain"
        (change)="readFile(file)"
      />
      <button mat-stroked-button type="button" (click)="file.click()">
        <mat-icon>upload_file</mat-icon>Upload a file…
      </button>
      @if (fileNote()) {
        <span class="muted" role="status">{{ fileNote() }}</span>
      }
    </div>
  `,
  styles: `
    :host {
      display: block;
    }
    .box {
      width: 100%;
    }
    textarea {
      font-family: ui-monospace, 'SFMono-Regular', Menlo, monospace;
    }
    .file {
      display: flex;
      align-items: center;
      gap: 12px;
      margin: 8px 0 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PasteOrUpload {
  readonly label = input.required<string>();
  readonly hint = input('');
  readonly rows = input(8);
  readonly testId = input<string | null>(null);
  readonly text = model('');
  protected readonly fileNote = signal<string | null>(null);

  protected updateText(event: Event): void {
    if (event.target instanceof HTMLTextAreaElement) this.text.set(event.target.value);
  }

  protected async readFile(field: HTMLInputElement): Promise<void> {
    const file = field.files?.[0];
    field.value = '';
    if (!file) return;
    if (file.size > MAX_FILE_BYTES) {
      this.fileNote.set(`${file.name} is larger than 1 MB; split it or paste a part.`);
      return;
    }
    this.text.set(await file.text());
    this.fileNote.set(`Read ${file.name}.`);
  }
}
