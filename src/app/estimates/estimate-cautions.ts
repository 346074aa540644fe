import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { CautionNote } from '../ui/caution-note';

/** The assumptions an estimate rests on, and the caution every result carries. */
@Component({
  selector: 'mac-estimate-cautions',
  imports: [CautionNote],
  template: `
    <section class="cautions" aria-label="Assumptions and cautions">
      <h3>Assumptions</h3>
      <ul>
        @for (a of assumptions(); track $index) {
          <li>{{ a }}</li>
        }
        <li>
          Photos become histories through a flank policy (left flanks, right flanks, animals known
          from both, or all): mixing flanks without linking them counts one animal twice and
          inflates the estimate.
        </li>
      </ul>
      <mac-caution-note icon="rule">
        <strong>These estimates hold only under their assumptions</strong> — closure, correct
        identification, independence and the flank policy chosen. Reports to a wildlife authority
        follow that authority's own standards and need a qualified analyst's review.
      </mac-caution-note>
    </section>
  `,
  styles: `
    .cautions {
      margin-top: 16px;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 0 0 4px;
    }
    ul {
      margin: 0 0 12px;
      padding-left: 20px;
      font: var(--mat-sys-body-medium);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EstimateCautions {
  readonly assumptions = input<readonly string[]>([]);
}
