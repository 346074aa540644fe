import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { SessionInputs, SessionSummary } from '../../../shared/analyses';
import { localDay } from './analysis-format';
import { effortPieces, historyPieces, occasionDays, occasionTitles } from './heatmap-data';
import { MatrixHeatmap } from './matrix-heatmap';
import { WarningList } from './warning-list';

/** A built session at a glance: counts, warnings, the effort grid and the capture histories. */
@Component({
  selector: 'mac-session-overview',
  imports: [MatrixHeatmap, WarningList],
  template: `
    @let s = summary();
    <p class="lead" data-testid="session-summary">
      <strong>{{ s.individuals }}</strong> individuals,
      <strong>{{ s.detections }}</strong> detections ({{ s.sightings }} confirmed sightings) on
      <strong>{{ s.occasions }}</strong> occasions at {{ s.activeStations }} of
      {{ s.stations }} stations; {{ s.effortDays }} station-days of effort.
    </p>
    @if (leftOut(); as text) {
      <p class="muted">{{ text }}</p>
    }
    <mac-warning-list [warnings]="warnings()" label="About this session" />
    <div class="grids">
      <figure>
        <figcaption>Effort grid: days each station worked per occasion</figcaption>
        <mac-matrix-heatmap
          data-testid="effort-heatmap"
          [rows]="stationCodes()"
          [columns]="columns()"
          [values]="inputs().effort"
          [pieces]="effort()"
          unit="days active"
          ariaLabel="Heatmap of the effort grid: stations by occasions, coloured by days active; grey means no working camera"
        />
      </figure>
      <figure>
        <figcaption>Capture histories: individuals by occasion</figcaption>
        @if (inputs().individuals.length > 0) {
          <mac-matrix-heatmap
            data-testid="history-heatmap"
            [rows]="individualCodes()"
            [columns]="columns()"
            [values]="histories()"
            [pieces]="history"
            ariaLabel="Heatmap of the capture histories: individuals by occasions, coloured where detected"
          />
        } @else {
          <p class="muted">No individual was detected in this session.</p>
        }
      </figure>
    </div>
  `,
  styles: `
    .lead {
      font: var(--mat-sys-body-large);
      margin: 8px 0;
    }
    .grids {
      display: grid;
      gap: 16px;
      grid-template-columns: repeat(auto-fit, minmax(420px, 1fr));
      margin-top: 12px;
    }
    figure {
      margin: 0;
    }
    figcaption {
      font: var(--mat-sys-title-small);
      margin-bottom: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SessionOverview {
  readonly inputs = input.required<SessionInputs>();
  readonly summary = input.required<SessionSummary>();
  readonly warnings = input<readonly string[]>([]);
  readonly timezone = input('UTC');
  protected readonly history = historyPieces();

  protected readonly stationCodes = computed(() => this.inputs().stations.map((s) => s.code));
  protected readonly individualCodes = computed(() => this.inputs().individuals.map((i) => i.code));
  protected readonly columns = computed(() =>
    occasionTitles(this.inputs().occasions, (iso) => localDay(iso, this.timezone())),
  );
  protected readonly histories = computed(() =>
    this.inputs().histories.map((h) => [...h].map(Number)),
  );
  protected readonly effort = computed(() =>
    effortPieces(occasionDays(this.inputs().parameters.occasionHours)),
  );

  protected readonly leftOut = computed(() => {
    const { flank, quality, offEffort } = this.summary().leftOut;
    const parts = [
      flank > 0 ? `${flank} by the flank policy` : '',
      quality > 0 ? `${quality} below the photo quality` : '',
      offEffort > 0 ? `${offEffort} at a station whose cameras were not working` : '',
    ].filter(Boolean);
    return parts.length > 0 ? `Confirmed sightings left out: ${parts.join(', ')}.` : null;
  });
}
