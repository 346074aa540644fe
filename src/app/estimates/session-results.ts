import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatProgressBar } from '@angular/material/progress-bar';
import {
  FLANK_POLICY_LABELS,
  FLANK_POLICY_RULES,
  type AnalysisResults,
  type SessionInputs,
} from '../../../shared/analyses';
import type { SecrProgressView } from '../../../shared/estimate-api';
import { ClosedResults } from './closed-results';
import { DetectionMap } from './detection-map';
import { formatInterval, formatNumber } from './estimate-format';
import type { CaptureRow, TrapRow } from './estimate-input';
import { SecrResults } from './secr-results';
import { TwoStepTable } from './two-step-table';
import { WarningList } from './warning-list';

/** SECR traps and captures of a session (stations by code, individuals by code). */
export function secrRows(inputs: SessionInputs): { traps: TrapRow[]; captures: CaptureRow[] } {
  const traps = inputs.stations.map((s) => ({ id: s.code, x: s.x, y: s.y }));
  const captures: CaptureRow[] = [];
  for (const [i, s, k, n] of inputs.detections) {
    for (let c = 0; c < n; c++) {
      captures.push({
        animal: inputs.individuals[i]?.code ?? String(i),
        occasion: s + 1,
        trap: inputs.stations[k]?.code ?? String(k),
      });
    }
  }
  return { traps, captures };
}

/** What the models gave on a session: abundance, density, the two-step comparison and the map. */
@Component({
  selector: 'mac-session-results',
  imports: [ClosedResults, DetectionMap, MatProgressBar, SecrResults, TwoStepTable, WarningList],
  template: `
    @let r = results();
    <p class="policy" data-testid="flank-policy">
      <strong>{{ policyLabel() }}.</strong> {{ policyRule() }}
    </p>

    <h3>Abundance (closed population)</h3>
    @if (r.closed; as closed) {
      <mac-closed-results [result]="closed" />
    } @else {
      <p class="muted" role="status">No abundance estimate: {{ r.closedReason }}</p>
    }

    @if (r.twoSample; as two) {
      <h3>Two occasions: two samples</h3>
      @if (two.reason) {
        <p class="muted" role="status">No two-sample estimate: {{ two.reason }}</p>
      } @else {
        <p data-testid="two-sample">
          Chapman (1951) N̂ = {{ fmt(two.chapman.N) }}, 95 % CI
          {{ interval(two.chapman.ci) }} (log-normal); Lincoln–Petersen N̂ =
          {{ fmt(two.lincolnPetersen.N) }}.
        </p>
        <mac-warning-list [warnings]="two.warnings" label="About the two-sample estimate" />
      }
    }

    <h3>Density (SECR)</h3>
    @if (r.secr; as secr) {
      <mac-secr-results [result]="secr" [traps]="rows().traps" [captures]="rows().captures" />
    } @else if (progress(); as p) {
      <div class="progress" role="status" aria-live="polite">
        <mat-progress-bar
          mode="determinate"
          [value]="percent()"
          aria-label="Density fit progress"
        />
        <span class="muted">{{ p.stage }} — {{ percent() }} %</span>
      </div>
    } @else if (r.secrRequested) {
      <p class="muted" role="status">
        No density estimate: {{ r.secrReason ?? 'the fit has not finished.' }}
      </p>
    } @else {
      <p class="muted">SECR density was not fitted in this run.</p>
    }

    <h3>Two-step density (older method, for comparison)</h3>
    <mac-two-step-table [twoStep]="r.twoStep" [reason]="r.twoStepReason" />

    @if (showMap()) {
      <h3>Stations and detections</h3>
      <mac-detection-map [inputs]="inputs()" />
    }
  `,
  styles: `
    h3 {
      font: var(--mat-sys-title-medium);
      margin: 24px 0 4px;
    }
    .policy {
      font: var(--mat-sys-body-medium);
      margin: 8px 0;
    }
    .progress {
      display: grid;
      gap: 4px;
      max-width: 560px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SessionResults {
  readonly results = input.required<AnalysisResults>();
  readonly inputs = input.required<SessionInputs>();
  readonly progress = input<SecrProgressView | null>(null);
  /** The printed report leaves the detection map out (exact locations of a sensitive species). */
  readonly showMap = input(true);

  protected readonly rows = computed(() => secrRows(this.inputs()));
  protected readonly fmt = formatNumber;
  protected readonly interval = formatInterval;
  protected readonly percent = computed(() => Math.round(100 * (this.progress()?.fraction ?? 0)));
  protected readonly policyLabel = computed(
    () => FLANK_POLICY_LABELS[this.inputs().parameters.flankPolicy],
  );
  protected readonly policyRule = computed(
    () => FLANK_POLICY_RULES[this.inputs().parameters.flankPolicy],
  );
}
