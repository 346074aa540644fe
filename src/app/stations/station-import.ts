import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import type { StationImportReport } from '../../../shared/stations';
import { isApiErrorBody } from '../../../shared/errors';
import { apiErrorMessage } from '../core/api-error';
import { StationsApi } from './stations-api';

/** CSV import of stations: checked row by row on the server; nothing is imported until the file is clean. */
@Component({
  selector: 'mac-station-import',
  imports: [MatCard, MatCardHeader, MatCardTitle, MatCardContent, MatButton],
  template: `
    <mat-card appearance="outlined">
      <mat-card-header><mat-card-title>Import stations from CSV</mat-card-title></mat-card-header>
      <mat-card-content>
        <p class="muted">
          Columns: <code>code</code>, <code>name</code>, <code>latitude</code>,
          <code>longitude</code>, <code>notes</code> (decimal degrees, WGS84). Every row is checked
          first.
        </p>
        <input
          type="file"
          accept=".csv,text/csv,text/plain"
          (change)="pick($event)"
          aria-label="CSV file of stations"
        />
        @if (fileName()) {
          <div class="actions">
            <button mat-stroked-button (click)="run(true)" [disabled]="busy()">Check</button>
            <button mat-flat-button (click)="run(false)" [disabled]="busy()">Import</button>
          </div>
        }
        @if (message()) {
          <p role="status">{{ message() }}</p>
        }
        @if (report(); as r) {
          @if (r.problems.length) {
            <table class="problems" data-testid="import-problems">
              <thead>
                <tr>
                  <th>Row</th>
                  <th>Code</th>
                  <th>What is wrong</th>
                </tr>
              </thead>
              <tbody>
                @for (p of r.problems; track p.row + '-' + p.code) {
                  <tr>
                    <td>{{ p.row }}</td>
                    <td>{{ p.code ?? '—' }}</td>
                    <td>{{ p.problems.join(' ') }}</td>
                  </tr>
                }
              </tbody>
            </table>
          }
        }
      </mat-card-content>
    </mat-card>
  `,
  styles: `
    .actions {
      display: flex;
      gap: 8px;
      margin: 12px 0;
    }
    .problems {
      width: 100%;
      border-collapse: collapse;
      color: var(--mat-sys-on-error-container);
      background: var(--mat-sys-error-container);
      border-radius: 8px;
    }
    .problems td,
    .problems th {
      padding: 4px 8px;
      text-align: left;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StationImport {
  private readonly api = inject(StationsApi);
  readonly slug = input.required<string>();
  readonly imported = output<number>();
  protected readonly fileName = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly message = signal<string | null>(null);
  protected readonly report = signal<StationImportReport | null>(null);
  private csv = '';

  protected async pick(event: Event): Promise<void> {
    const file = (event.target as HTMLInputElement).files?.[0];
    this.report.set(null);
    this.message.set(null);
    if (!file) return;
    this.csv = await file.text();
    this.fileName.set(file.name);
  }

  protected async run(dryRun: boolean): Promise<void> {
    this.busy.set(true);
    try {
      const report = await this.api.importCsv(this.slug(), this.csv, dryRun);
      this.report.set(report);
      this.message.set(
        dryRun
          ? `All ${report.rows} rows are fine. Press Import to add them.`
          : `${report.imported} stations imported.`,
      );
      if (!dryRun) this.imported.emit(report.imported);
    } catch (err) {
      const details =
        err instanceof HttpErrorResponse && isApiErrorBody(err.error)
          ? err.error.error.details
          : null;
      const report = (details as { report?: StationImportReport } | null)?.report ?? null;
      this.report.set(report);
      this.message.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
