import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { SecrJobView, SecrResponse } from '../../../shared/estimate-api';
import { provideCharts } from '../ui/charts';
import { SecrCalculator } from './secr-calculator';

// A response shaped like the server's; the numbers are made up for the screen, not a fit.
const RESULT: SecrResponse = {
  detector: 'proximity',
  D: 12.34,
  se: 2.1,
  ci: [8.9, 17.1],
  densityPer100km2: 1234,
  ciPer100km2: [890, 1710],
  g0: 0.21,
  sigma: 48,
  logLik: -250.5,
  esa: 3.4,
  n: 42,
  detections: 120,
  bufferCheck: { buffer: 300, D: 12.35, relativeChange: 0.001 },
  mask: { spacing: 25, buffer: 200, points: 1800 },
  units: { D: 'animals per km²', sigma: 'm', esa: 'km²', mask: 'm' },
  warnings: ['Only 4 animal(s) were detected at more than one trap.'],
  assumptions: ['Activity centres are spread at random.'],
};

describe('SecrCalculator', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SecrCalculator],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideCharts()],
    });
  });
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

  it('should start a job, show its progress, then the density with its warnings', async () => {
    const fixture = TestBed.createComponent(SecrCalculator);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const type = (selector: string, value: string) => {
      const el = root.querySelector<HTMLTextAreaElement | HTMLInputElement>(selector)!;
      el.value = value;
      el.dispatchEvent(new Event('input'));
    };
    type('[data-testid=traps-input]', 'id,x,y\nA,0,0\nB,100,0\n');
    type('[data-testid=captures-input]', 'animal,occasion,trap\nL1,1,A\nL1,2,B\n');
    type('input[formcontrolname=occasions]', '3');
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    const http = TestBed.inject(HttpTestingController);
    const start = http.expectOne('/api/estimate/secr/jobs');
    expect(start.request.body).toEqual({
      traps: [
        { id: 'A', x: 0, y: 0 },
        { id: 'B', x: 100, y: 0 },
      ],
      occasions: 3,
      detector: 'proximity',
      captures: [
        { animal: 'L1', occasion: 1, trap: 'A' },
        { animal: 'L1', occasion: 2, trap: 'B' },
      ],
    });
    start.flush({ id: 'job1' });
    await wait(20);
    const running: SecrJobView = {
      id: 'job1',
      status: 'running',
      progress: { stage: 'fitting (start 2 of 3)', fraction: 0.28 },
      createdAt: '2026-01-01T00:00:00Z',
    };
    http.expectOne('/api/estimate/secr/jobs/job1').flush(running);
    await wait(20);
    await fixture.whenStable();
    expect(root.querySelector('[role=status]')?.textContent).toContain(
      'fitting (start 2 of 3) — 28 %',
    );
    await wait(520);
    http.expectOne('/api/estimate/secr/jobs/job1').flush({
      ...running,
      status: 'done',
      progress: { stage: 'done', fraction: 1 },
      result: RESULT,
    });
    await wait(20);
    await fixture.whenStable();
    const results = root.querySelector('[data-testid=secr-results]')!;
    expect(results.querySelector('[data-testid=density-km2]')?.textContent).toContain(
      '12.34 per km²',
    );
    expect(results.textContent).toContain('1,234.0 (95 % CI 890.0 – 1,710.0)');
    expect(results.textContent).toContain('Only 4 animal(s) were detected at more than one trap.');
    expect(results.textContent).toContain("qualified analyst's review");
    expect(results.querySelector('mac-detection-chart')).not.toBeNull();
    expect(results.querySelector('mac-trap-plot')).not.toBeNull();
    http.expectNone('/api/estimate/secr/jobs/job1');
  });

  it('should name a capture at an unknown trap and send nothing', async () => {
    const fixture = TestBed.createComponent(SecrCalculator);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const traps = root.querySelector<HTMLTextAreaElement>('[data-testid=traps-input]')!;
    traps.value = 'A,0,0\nB,100,0';
    traps.dispatchEvent(new Event('input'));
    const captures = root.querySelector<HTMLTextAreaElement>('[data-testid=captures-input]')!;
    captures.value = 'L1,1,Z';
    captures.dispatchEvent(new Event('input'));
    root.querySelector('form')!.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
    TestBed.inject(HttpTestingController).expectNone('/api/estimate/secr/jobs');
    expect(root.querySelector('[data-testid=input-problems]')?.textContent).toContain(
      'Line 1: trap Z is not in the trap list.',
    );
  });
});
