import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Difference, RerunComparison, SessionInputs } from '../../../shared/analyses';
import { formatNumber, modelLabel } from './estimate-format';
import { SessionResults } from './session-results';

/** One line of the side-by-side table. */
export interface ComparisonRow {
  label: string;
  before: string;
  after: string;
  change: string;
  changed: boolean;
}

function signed(change: number | null, digits: number): string {
  if (change === null) return '—';
  if (Math.abs(change) < 0.5 * 10 ** -digits) return 'no change';
  return `${change > 0 ? '+' : '−'}${formatNumber(Math.abs(change), digits)}`;
}

function row(label: string, d: Difference, digits: number): ComparisonRow {
  return {
    label,
    before: formatNumber(d.before, digits),
    after: formatNumber(d.after, digits),
    change: signed(d.change, digits),
    changed:
      d.before !== d.after && !(d.change !== null && Math.abs(d.change) < 0.5 * 10 ** -digits),
  };
}

/** The comparison as table rows: counts, density, then N̂ per model. */
export function comparisonRows(cmp: RerunComparison): ComparisonRow[] {
  const d = cmp.differences;
  return [
    row('Individuals caught (S)', d.S, 0),
    row('Detections', d.detections, 0),
    row('Confirmed sightings used', d.sightings, 0),
    row('Occasions', d.occasions, 0),
    row('SECR D̂ per 100 km²', d.densityPer100km2, 2),
    ...d.models.map((m) => row(`N̂ ${modelLabel(m.model)}`, m, 1)),
  ];
}

/** A list of individual codes, or a dash. */
function codes(list: readonly { code: string }[]): string {
  return list.length > 0 ? list.map((i) => i.code).join(', ') : 'none';
}

/** Saved results beside the same parameters run on today's catalogue, with what changed. */
@Component({
  selector: 'mac-rerun-comparison',
  imports: [SessionResults],
  template: `
    @let c = comparison();
    <p class="lead" role="status" data-testid="rerun-verdict">
      @if (c.changed) {
        Today's catalogue gives different inputs from the data freeze.
      } @else {
        Today's catalogue gives exactly the inputs of the data freeze.
      }
    </p>
    <div class="table-scroll">
      <table class="estimates" data-testid="rerun-table">
        <thead>
          <tr>
            <th scope="col"></th>
            <th scope="col" class="num">Saved</th>
            <th scope="col" class="num">Today</th>
            <th scope="col" class="num">Change</th>
          </tr>
        </thead>
        <tbody>
          @for (r of rows(); track r.label) {
            <tr [class.best]="r.changed">
              <th scope="row">{{ r.label }}</th>
              <td class="num">{{ r.before }}</td>
              <td class="num">{{ r.after }}</td>
              <td class="num">{{ r.change }}</td>
            </tr>
          }
        </tbody>
      </table>
    </div>
    <dl class="figures">
      <dt>Individuals no longer in the session</dt>
      <dd data-testid="disappeared">{{ disappeared() }}</dd>
      <dt>Individuals new to the session</dt>
      <dd>{{ appeared() }}</dd>
      <dt>Sightings no longer used / newly used</dt>
      <dd>
        {{ c.differences.sightingsDisappeared.length }} /
        {{ c.differences.sightingsAppeared.length }}
      </dd>
    </dl>
    <details>
      <summary>Today's full results</summary>
      <mac-session-results [results]="c.current" [inputs]="currentInputs()" />
    </details>
  `,
  styleUrl: './estimate-results.scss',
  styles: `
    .figures {
      margin: 12px 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RerunComparisonView {
  readonly comparison = input.required<RerunComparison>();
  protected readonly rows = computed(() => comparisonRows(this.comparison()));
  protected readonly disappeared = computed(() =>
    codes(this.comparison().differences.individualsDisappeared),
  );
  protected readonly appeared = computed(() =>
    codes(this.comparison().differences.individualsAppeared),
  );
  protected readonly currentInputs = computed<SessionInputs>(() => this.comparison().currentInputs);
}
