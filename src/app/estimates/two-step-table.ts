import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { TwoStepComparison, TwoStepView } from '../../../shared/analyses';
import { CautionNote } from '../ui/caution-note';
import { formatNumber } from './estimate-format';

/** The older two-step densities (½MMDM, MMDM), shown only beside their published critique. */
@Component({
  selector: 'mac-two-step-table',
  imports: [CautionNote],
  template: `
    @if (twoStep(); as t) {
      <p>
        N̂ = {{ basisN() }} from {{ t.basis.model }} (lowest AICc), divided by the trap polygon
        buffered by W.
      </p>
      <div class="table-scroll">
        <table class="estimates" data-testid="two-step-table">
          <thead>
            <tr>
              <th scope="col">Buffer W</th>
              <th scope="col" class="num">MMDM (m)</th>
              <th scope="col" class="num">W (m)</th>
              <th scope="col" class="num">Area (km²)</th>
              <th scope="col" class="num">D̂ per 100 km²</th>
              <th scope="col" class="num">SE</th>
            </tr>
          </thead>
          <tbody>
            @for (row of rows(); track row.label) {
              <tr>
                <th scope="row">{{ row.label }}</th>
                @if (row.reason) {
                  <td colspan="5" class="none">{{ row.reason }}</td>
                } @else {
                  <td class="num">{{ row.mmdm }}</td>
                  <td class="num">{{ row.W }}</td>
                  <td class="num">{{ row.area }}</td>
                  <td class="num">{{ row.D }}</td>
                  <td class="num">{{ row.se }}</td>
                }
              </tr>
            }
          </tbody>
        </table>
      </div>
      <mac-caution-note icon="compare_arrows">
        <strong>For comparison only.</strong> {{ t.critique }}
      </mac-caution-note>
    } @else {
      <p class="muted">No two-step density: {{ reason() }}</p>
    }
  `,
  styleUrl: './estimate-results.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TwoStepTable {
  readonly twoStep = input<TwoStepComparison | null>(null);
  readonly reason = input<string | null>(null);

  protected readonly basisN = computed(() => formatNumber(this.twoStep()?.basis.N));

  protected readonly rows = computed(() => {
    const t = this.twoStep();
    if (!t) return [];
    const row = (label: string, v: TwoStepView) => ({
      label,
      reason: v.reason ?? null,
      mmdm: formatNumber(v.mmdm, 0),
      W: formatNumber(v.W, 0),
      area: formatNumber(v.areaKm2, 1),
      D: formatNumber(v.densityPer100km2, 2),
      se: formatNumber(v.se, 2),
    });
    return [
      row('½MMDM (Wilson & Anderson 1985)', t.halfMmdm),
      row('MMDM (Parmenter et al. 2003)', t.mmdm),
    ];
  });
}
