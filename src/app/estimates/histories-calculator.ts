import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { ClosedResponse } from '../../../shared/estimate-api';
import { apiErrorDetails, apiErrorMessage } from '../core/api-error';
import { ClosedResults } from './closed-results';
import { parseHistoriesText } from './estimate-input';
import { EstimatesApi } from './estimates-api';
import { PasteOrUpload } from './paste-or-upload';

/** Capture histories pasted or uploaded → every closed-population model. */
@Component({
  selector: 'mac-histories-calculator',
  imports: [ClosedResults, MatButton, MatProgressBar, PasteOrUpload],
  template: `
    <h2 class="calc-title">Capture histories</h2>
    <p class="muted intro">
      One animal per line, one character per occasion: 1 caught, 0 not caught (for example
      <code>010011</code>). A label before the history (<code>L07,010011</code>) and CSV with a
      header row are fine. List only animals caught at least once.
    </p>
    <form (submit)="estimate($event)">
      <mac-paste-or-upload
        label="Capture histories"
        hint="Paste, or upload a CSV or text file"
        testId="histories-input"
        [rows]="10"
        [(text)]="text"
      />
      @if (problems().length > 0) {
        <ul class="problems" role="alert" data-testid="input-problems">
          @for (p of problems(); track $index) {
            <li>{{ p }}</li>
          }
        </ul>
      }
      <button mat-flat-button type="submit" [disabled]="busy()">Estimate abundance</button>
    </form>
    @if (busy()) {
      <mat-progress-bar mode="indeterminate" />
    }
    @if (result(); as r) {
      <mac-closed-results [result]="r" />
    }
  `,
  styleUrl: './calculator.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HistoriesCalculator {
  private readonly api = inject(EstimatesApi);
  protected readonly text = signal('');
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal(false);
  protected readonly result = signal<ClosedResponse | null>(null);

  protected async estimate(event: Event): Promise<void> {
    event.preventDefault();
    const parsed = parseHistoriesText(this.text());
    this.problems.set(parsed.problems);
    if (parsed.problems.length > 0) return;
    this.busy.set(true);
    this.result.set(null);
    try {
      this.result.set(await this.api.closed({ histories: parsed.rows.map((r) => r.history) }));
    } catch (err) {
      const details = apiErrorDetails(err);
      this.problems.set(details.length > 0 ? details : [apiErrorMessage(err)]);
    } finally {
      this.busy.set(false);
    }
  }
}
