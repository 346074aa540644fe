import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { ModelEstimate } from '../../../shared/estimate';
import type { ClosedResponse } from '../../../shared/estimate-api';
import { EstimateCautions } from './estimate-cautions';
import { formatInterval, formatNumber, modelLabel } from './estimate-format';
import { FrequencyChart } from './frequency-chart';
import { ModelChart, type ModelPoint } from './model-chart';
import { WarningList } from './warning-list';

/** One row of the model table. */
interface ModelRow {
  model: string;
  label: string;
  N: string;
  se: string;
  ci: string;
  aicc: string;
  delta: string;
  best: boolean;
  reason: string | null;
  warnings: string[];
}

/** The closed-population result: model table, AICc, closure test, warnings, charts, cautions. */
@Component({
  selector: 'mac-closed-results',
  imports: [EstimateCautions, FrequencyChart, ModelChart, WarningList],
  templateUrl: './closed-results.html',
  styleUrl: './estimate-results.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosedResults {
  readonly result = input.required<ClosedResponse>();

  protected readonly rows = computed<ModelRow[]>(() => {
    const r = this.result();
    const table = new Map(r.aiccTable.rows.map((row) => [row.model as string, row]));
    const bestModel = r.aiccTable.rows[0]?.model;
    return [...r.models, ...r.otherModels].map((m: ModelEstimate) => {
      const aic = table.get(m.model);
      const reason = m.N === null ? (m.reason ?? 'This model gives no estimate here.') : null;
      return {
        model: m.model,
        label: modelLabel(m.model),
        N: formatNumber(m.N),
        se: formatNumber(m.se, 2),
        ci: formatInterval(m.ci),
        aicc: aic?.aicc != null ? formatNumber(aic.aicc, 2) : '',
        delta: aic?.deltaAicc != null ? formatNumber(aic.deltaAicc, 2) : '',
        best: m.model === bestModel,
        reason,
        warnings: m.warnings.filter((w) => w !== reason),
      };
    });
  });

  protected readonly points = computed<ModelPoint[]>(() => {
    const r = this.result();
    return [...r.models, ...r.otherModels]
      .filter((m): m is ModelEstimate & { N: number } => m.N !== null)
      .map((m) => ({ model: m.model, N: m.N, ci: m.ci }));
  });

  protected readonly closure = computed(() => {
    const c = this.result().closureTest;
    return c ? { ...c, zText: formatNumber(c.z, 2), pText: formatNumber(c.p, 2) } : null;
  });
}
