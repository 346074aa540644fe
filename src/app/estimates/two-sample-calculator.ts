import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { TwoSampleResponse } from '../../../shared/estimate-api';
import { apiErrorMessage } from '../core/api-error';
import { EstimateCautions } from './estimate-cautions';
import { formatInterval, formatNumber } from './estimate-format';
import { EstimatesApi } from './estimates-api';
import { WarningList } from './warning-list';

const WHOLE = [Validators.required, Validators.min(0), Validators.pattern(/^\d+$/)];

/** Assumptions of the two-sample method, shown beside its result. */
export const TWO_SAMPLE_ASSUMPTIONS = [
  'The population was closed between the two samples: no births, deaths or movement in or out.',
  'Marks were not lost and every marked animal was recognised in the second sample.',
  'Marked and unmarked animals were equally likely to be caught in the second sample.',
];

/** M marked, C caught in the second sample, R of them marked → Lincoln–Petersen and Chapman. */
@Component({
  selector: 'mac-two-sample-calculator',
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
  templateUrl: './two-sample-calculator.html',
  styleUrls: ['./calculator.scss', './estimate-results.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TwoSampleCalculator {
  private readonly api = inject(EstimatesApi);
  protected readonly assumptions = TWO_SAMPLE_ASSUMPTIONS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    M: ['', WHOLE],
    C: ['', WHOLE],
    R: ['', WHOLE],
  });
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly result = signal<TwoSampleResponse | null>(null);

  protected readonly view = computed(() => {
    const r = this.result();
    if (!r) return null;
    const i = r.chapman.intervals;
    return {
      chapmanN: formatNumber(r.chapman.N),
      chapmanSe: formatNumber(r.chapman.se, 2),
      chapmanCi: formatInterval(r.chapman.ci),
      lpN: formatNumber(r.lincolnPetersen.N),
      lpSe: formatNumber(r.lincolnPetersen.se, 2),
      intervals: [
        { name: 'Normal (N̂ ± 1.96 SE)', ci: formatInterval(i.normal) },
        { name: 'Exact binomial on R/C', ci: formatInterval(i.exactBinomial) },
        {
          name: 'Exact Poisson on R (used when R/C < 0.1)',
          ci: i.exactPoisson ? formatInterval(i.exactPoisson) : 'not used: R/C is 0.1 or more',
        },
        { name: 'Profile likelihood', ci: formatInterval(i.profileLikelihood, 0) },
      ],
    };
  });

  protected async estimate(event: Event): Promise<void> {
    event.preventDefault();
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.busy.set(true);
    this.error.set(null);
    this.result.set(null);
    try {
      this.result.set(await this.api.twoSample({ M: +v.M, C: +v.C, R: +v.R }));
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
