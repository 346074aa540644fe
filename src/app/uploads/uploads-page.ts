import { DatePipe } from '@angular/common';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { UploadListItem } from '../../../shared/ingest';
import { ProjectStore } from '../core/project-store';
import { EmptyState } from '../ui/empty-state';

/** Card uploads: volunteers see their own, reviewers and above everyone's. */
@Component({
  selector: 'mac-uploads-page',
  imports: [DatePipe, RouterLink, MatButton, MatIcon, MatProgressBar, EmptyState],
  template: `
    <div class="page">
      <header class="head">
        <h1 class="page-title">Card uploads</h1>
        <a mat-flat-button routerLink="new"><mat-icon>upload</mat-icon>Upload a card</a>
      </header>
      @if (uploads.isLoading()) {
        <mat-progress-bar mode="indeterminate" />
      }
      <table class="table" data-testid="uploads">
        <thead>
          <tr>
            <th>When</th>
            <th>Station · camera</th>
            <th>By</th>
            <th>Accepted</th>
            <th>Duplicates</th>
            <th>Rejected</th>
            <th>Processing</th>
            <th>Flags</th>
          </tr>
        </thead>
        <tbody>
          @for (u of uploads.value(); track u.id) {
            <tr>
              <td>
                <a [routerLink]="[u.id]">{{ u.createdAt | date: 'medium' }}</a>
              </td>
              <td>{{ u.stationCode }} · {{ u.cameraLabel }}</td>
              <td>{{ u.uploaderName }}</td>
              <td>{{ u.counts.accepted }}</td>
              <td>{{ u.counts.duplicate }}</td>
              <td [class.bad]="u.counts.rejected">{{ u.counts.rejected }}</td>
              <td>
                @if (u.done) {
                  {{ u.counts.ready }} ready
                  @if (u.counts.failed) {
                    <span class="bad">, {{ u.counts.failed }} failed</span>
                  }
                } @else {
                  {{ u.counts.queued + u.counts.processing }} waiting
                }
              </td>
              <td>{{ flagCount(u) || '—' }}</td>
            </tr>
          }
        </tbody>
      </table>
      @if (!uploads.isLoading() && !uploads.value().length) {
        <mac-empty-state
          icon="sd_card"
          title="No cards uploaded yet"
          message="Upload the photos of a memory card to one deployment; duplicates are recognised by content."
        />
      }
    </div>
  `,
  styles: `
    .head {
      display: flex;
      justify-content: space-between;
      align-items: center;
    }
    .table {
      width: 100%;
      border-collapse: collapse;
    }
    .table th {
      text-align: left;
      font: var(--mat-sys-label-large);
      color: var(--mat-sys-on-surface-variant);
      padding: 8px;
    }
    .table td {
      padding: 6px 8px;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
    .bad {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UploadsPage {
  private readonly store = inject(ProjectStore);
  private readonly slug = computed(() => this.store.current()?.slug ?? '');
  protected readonly uploads = httpResource<UploadListItem[]>(
    () => `/api/projects/${this.slug()}/uploads`,
    { defaultValue: [] },
  );

  protected flagCount(u: UploadListItem): number {
    return Object.values(u.flagged).reduce((sum, n) => sum + (n ?? 0), 0);
  }
}
