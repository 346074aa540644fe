import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { ClosedModelName, ModelEstimate } from '../../../shared/estimate';
import type { ClosedResponse } from '../../../shared/estimate-api';
import { provideCharts } from '../ui/charts';
import { HistoriesCalculator } from './histories-calculator';

const model = <M extends ClosedModelName>(
  m: Partial<ModelEstimate> & { model: M },
): ModelEstimate & { model: M } => ({
  N: 40,
  se: 2,
  ci: [38, 46],
  warnings: [],
  ...m,
});

// A response shaped like the server's; the numbers are made up for the screen, not estimates.
const RESPONSE: ClosedResponse = {
  S: 38,
  t: 6,
  models: [
    model({ model: 'M0', aicc: 164.44 }),
    model({ model: 'Mb', N: 42.26, ci: [38.96, 56.83], aicc: 155.28 }),
    model({
      model: 'Schnabel',
      N: 35.29,
      warnings: ['The estimate (35.3) is below the 38 animals actually caught.'],
    }),
    model({
      model: 'Mh-chao',
      N: null,
      se: null,
      ci: null,
      reason: 'No animal was caught exactly twice.',
      warnings: ['No animal was caught exactly twice.'],
    }),
  ],
  otherModels: [model({ model: 'Mh-mixture', ci: [38, null] })],
  aiccTable: {
    kind: 'full-likelihood',
    n: 38,
    note: 'AICc uses n = S = 38 animals caught as the sample size.',
    rows: [
      { model: 'Mb', logLik: -74.3, k: 3, aicc: 155.28, deltaAicc: 0, weight: 0.98 },
      { model: 'M0', logLik: -80.0, k: 2, aicc: 164.44, deltaAicc: 9.16, weight: 0.02 },
    ],
  },
  closureTest: {
    z: -0.8,
    p: 0.21,
    animalsUsed: 31,
    interpretation: 'No evidence against closure.',
  },
  summary: {
    caught: [15, 20, 16, 19, 25, 25],
    firstCaptures: [15, 8, 6, 3, 3, 3],
    recaptures: [0, 12, 10, 16, 22, 22],
    frequencies: [9, 6, 7, 9, 6, 1],
  },
  warnings: ['Only 38 animals: treat the estimate as rough.'],
  assumptions: ['The population was closed during the session.'],
};

describe('HistoriesCalculator', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [HistoriesCalculator],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideCharts()],
    });
  });
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  /** Lets the awaited HTTP call resume, then waits for the view to catch up. */
  async function settle(fixture: { whenStable(): Promise<unknown> }): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  async function submit(text: string) {
    const fixture = TestBed.createComponent(HistoriesCalculator);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const box = root.querySelector('textarea')!;
    box.value = text;
    box.dispatchEvent(new Event('input'));
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
    return { fixture, root };
  }

  it('should send the pasted histories and show every model with its warnings beside it', async () => {
    const { fixture, root } = await submit('L1,010011\nL2,110000\n');
    const req = TestBed.inject(HttpTestingController).expectOne('/api/estimate/closed');
    expect(req.request.body).toEqual({ histories: ['010011', '110000'] });
    req.flush(RESPONSE);
    await settle(fixture);

    const table = root.querySelector('[data-testid=model-table]')!;
    const mb = table.querySelector('tr[data-model=Mb]')!;
    expect(mb.textContent).toContain('lowest AICc');
    expect(mb.textContent).toContain('42.3');
    expect(mb.textContent).toContain('39.0 – 56.8');
    const schnabelWarning = table.querySelector('tr[data-model=Schnabel] + tr.warning-row');
    expect(schnabelWarning?.textContent).toContain('below the 38 animals actually caught');
    expect(table.querySelector('tr[data-model=Mh-chao]')?.textContent).toContain(
      'No estimate: No animal was caught exactly twice.',
    );
    expect(table.querySelector('tr[data-model=Mh-mixture]')?.textContent).toContain(
      'no finite upper limit',
    );
    expect(root.textContent).toContain('n = S = 38');
    expect(root.textContent).toContain('Only 38 animals: treat the estimate as rough.');
    expect(root.querySelector('[data-testid=closure-test]')?.textContent).toContain('P = 0.21');
    expect(root.textContent).toContain("qualified analyst's review");
    expect(root.querySelectorAll('mac-model-chart, mac-frequency-chart')).toHaveLength(2);
    await settle(fixture);
    expect(root.querySelector('mac-model-chart [role=img]')?.getAttribute('aria-label')).toContain(
      '38 animals were caught',
    );
    expect(root.querySelector('mac-frequency-chart svg')).not.toBeNull();
  });

  it('should name the faulty line and send nothing when a history is malformed', async () => {
    const { root } = await submit('0101\n01x1\n');
    TestBed.inject(HttpTestingController).expectNone('/api/estimate/closed');
    expect(root.querySelector('[data-testid=input-problems]')?.textContent).toContain(
      'Line 2 ("01x1") has characters other than 0 and 1',
    );
  });

  it('should show the server’s explanation when it refuses the histories', async () => {
    const { fixture, root } = await submit('01\n10\n');
    TestBed.inject(HttpTestingController)
      .expectOne('/api/estimate/closed')
      .flush(
        {
          error: {
            code: 'validation_failed',
            message: 'A single occasion cannot estimate abundance.',
          },
        },
        { status: 400, statusText: 'Bad Request' },
      );
    await settle(fixture);
    expect(root.querySelector('[role=alert]')?.textContent).toContain(
      'A single occasion cannot estimate abundance.',
    );
  });
});
