import { HttpClient, HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatAnchor, MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { ImportResponse } from '../../../shared/exports';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';
import { CautionNote } from '../ui/caution-note';

/** The admin's data tools: a consistent backup of the whole instance, and Camtrap DP imports. */
@Component({
  selector: 'mac-data-page',
  imports: [MatAnchor, MatButton, MatIcon, MatProgressBar, RouterLink, CautionNote],
  template: `
    <section>
      <h2>Backup</h2>
      <p>
        One zip with the database (a consistent snapshot taken while Maculo runs) and every stored
        photo. The README's “Backup and restore” says how to bring it back.
      </p>
      <mac-caution-note icon="lock">
        A backup holds exact locations, photos of people and everyone's account. Store it encrypted
        and where only administrators can reach it.
      </mac-caution-note>
      <a mat-flat-button href="/api/admin/backup" download data-testid="download-backup">
        <mat-icon>backup</mat-icon> Download a backup
      </a>
    </section>

    <section>
      <h2>Import a Camtrap DP package</h2>
      <p>
        A package (zip) from another team or an earlier export becomes a new project: stations,
        deployments, photos (stored when the zip has the files), observations and individuals. You
        become the new project's ecologist.
      </p>
      <input
        #file
        type="file"
        accept=".zip,application/zip"
        (change)="choose(file.files)"
        data-testid="import-file"
        hidden
      />
      <button mat-stroked-button type="button" (click)="file.click()" [disabled]="busy()">
        <mat-icon>upload_file</mat-icon> Choose a package…
      </button>
      @if (busy()) {
        <p>{{ stage() }}</p>
        <mat-progress-bar
          [mode]="progress() === null ? 'indeterminate' : 'determinate'"
          [value]="progress() ?? 0"
          aria-label="Import progress"
        />
      }
      @if (error(); as message) {
        <p class="error" role="alert">{{ message }}</p>
      }
      @if (result(); as r) {
        <div class="report" data-testid="import-report">
          <p>
            Imported into
            <a [routerLink]="['/p', r.project.slug, 'overview']">{{ r.project.slug }}</a>:
            {{ r.report.counts.stations }} stations, {{ r.report.counts.deployments }} deployments,
            {{ r.report.counts.media }} photos ({{ r.report.counts.mediaFiles }} with their files),
            {{ r.report.counts.observations }} observations,
            {{ r.report.counts.sightings }} sightings,
            {{ r.report.counts.individuals }} individuals.
          </p>
          @for (note of r.report.notes; track note) {
            <p class="muted">{{ note }}</p>
          }
          @if (r.report.skipped.length) {
            <h3>Left out ({{ r.report.skipped.length }})</h3>
            <table>
              <thead>
                <tr>
                  <th>Table</th>
                  <th>Row</th>
                  <th>Id</th>
                  <th>Why</th>
                </tr>
              </thead>
              <tbody>
                @for (s of r.report.skipped.slice(0, 200); track $index) {
                  <tr>
                    <td>{{ s.table }}</td>
                    <td>{{ s.row }}</td>
                    <td>{{ s.id ?? '—' }}</td>
                    <td>{{ s.reason }}</td>
                  </tr>
                }
              </tbody>
            </table>
            @if (r.report.skipped.length > 200) {
              <p class="muted">… and {{ r.report.skipped.length - 200 }} more.</p>
            }
          } @else {
            <p>Nothing was left out.</p>
          }
        </div>
      }
    </section>
  `,
  styles: `
    section {
      max-width: 880px;
      display: flex;
      flex-direction: column;
      align-items: flex-start;
      gap: 8px;
      margin-bottom: 24px;
    }
    table {
      border-collapse: collapse;
    }
    th,
    td {
      text-align: left;
      padding: 4px 12px 4px 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DataPage {
  private readonly http = inject(HttpClient);
  private readonly auth = inject(AuthStore);
  protected readonly busy = signal(false);
  protected readonly stage = signal('');
  protected readonly progress = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly result = signal<ImportResponse | null>(null);

  protected choose(files: FileList | null): void {
    const file = files?.item(0);
    if (!file) return;
    const form = new FormData();
    form.append('package', file, file.name);
    this.busy.set(true);
    this.error.set(null);
    this.result.set(null);
    this.stage.set(`Sending ${file.name}…`);
    this.progress.set(0);
    this.http
      .post<ImportResponse>('/api/projects/import/camtrap-dp', form, {
        reportProgress: true,
        observe: 'events',
      })
      .subscribe({
        next: (event) => {
          if (event.type === HttpEventType.UploadProgress) {
            const sent = event.total ? Math.round((100 * event.loaded) / event.total) : null;
            this.progress.set(sent);
            if (sent === 100) {
              this.stage.set('Reading the package and creating the project…');
              this.progress.set(null);
            }
          } else if (event.type === HttpEventType.Response && event.body) {
            const body = event.body;
            // The importer is now the new project's ecologist: reload who we are before linking there.
            void this.auth.refresh().then(() => this.result.set(body));
          }
        },
        error: (err: unknown) => {
          this.error.set(apiErrorMessage(err));
          this.busy.set(false);
        },
        complete: () => this.busy.set(false),
      });
  }
}
