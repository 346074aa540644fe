import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { PlotsResponse } from '../../../shared/estimate-api';
import { apiErrorMessage } from '../core/api-error';
import { EstimateCautions } from './estimate-cautions';
import { parseCounts } from './estimate-input';
import { formatInterval, formatNumber } from './estimate-format';
import { EstimatesApi } from './estimates-api';
import { WarningList } from './warning-list';

/** Assumptions of the plot-count estimate, shown beside its result. */
export const PLOTS_ASSUMPTIONS = [
  'The counted plots were a simple random sample of all the plots in the area.',
  'Every animal in a counted plot was counted, and none was counted in two plots.',
  'Animals did not move between plots while they were being counted.',
];

/** Counts in sampled plots and the number of plots in the area → N̂ with a t interval. */
@Component({
  selector: 'mac-plots-calculator',
  imports: [
    EstimateCautions,
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    ReactiveFormsModule,
    WarningList,
  ],
  templateUrl: './plots-calculator.html',
  styleUrls: ['./calculator.scss', './estimate-results.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlotsCalculator {
  private readonly api = inject(EstimatesApi);
  protected readonly assumptions = PLOTS_ASSUMPTIONS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    counts: ['', Validators.required],
    totalPlots: ['', [Validators.required, Validators.min(1), Validators.pattern(/^\d+$/)]],
  });
  protected readonly problems = signal<string[]>([]);
  protected readonly busy = signal(false);
  protected readonly result = signal<PlotsResponse | null>(null);

  protected readonly view = computed(() => {
    const r = this.result();
    return r
      ? {
          N: formatNumber(r.N),
          se: formatNumber(r.se, 2),
          ci: formatInterval(r.ci),
          vmr: formatNumber(r.varianceToMean, 2),
        }
      : null;
  });

  protected async estimate(event: Event): Promise<void> {
    event.preventDefault();
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const { counts, totalPlots } = this.form.getRawValue();
    const parsed = parseCounts(counts);
    this.problems.set(parsed.problems);
    if (parsed.problems.length > 0) return;
    this.busy.set(true);
    this.result.set(null);
    try {
      this.result.set(await this.api.plots({ counts: parsed.rows, totalPlots: +totalPlots }));
    } catch (err) {
      this.problems.set([apiErrorMessage(err)]);
    } finally {
      this.busy.set(false);
    }
  }
}
