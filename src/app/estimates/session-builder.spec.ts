import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { SessionDefaults, SessionPreview } from '../../../shared/analyses';
import type { ProjectDetail } from '../../../shared/projects';
import { ProjectStore } from '../core/project-store';
import { provideCharts } from '../ui/charts';
import { SessionBuilder } from './session-builder';

const DEFAULTS: SessionDefaults = {
  timezone: 'Africa/Nairobi',
  occasionHours: 24,
  firstDay: '2026-07-01',
  lastDay: '2026-08-29',
  stations: [
    { id: 's1', code: 'A', name: 'Ridge' },
    { id: 's2', code: 'B', name: 'Gully' },
  ],
};

// A session shaped like the server's (synthetic numbers for the screen).
const PREVIEW: SessionPreview = {
  hash: 'f'.repeat(64),
  warnings: ['Station(s) B had no working camera during the session.'],
  summary: {
    occasions: 2,
    stations: 2,
    activeStations: 1,
    individuals: 2,
    detections: 3,
    sightings: 3,
    effortDays: 1.75,
    leftOut: { flank: 1, quality: 0, offEffort: 0 },
  },
  inputs: {
    parameters: {
      start: '2026-06-30T21:00:00Z',
      end: '2026-07-02T21:00:00Z',
      stationIds: null,
      occasionHours: 24,
      flankPolicy: 'left',
      minQuality: 'fair',
      closurePeriodDays: 90,
    },
    occasions: [
      { start: '2026-06-30T21:00:00Z', end: '2026-07-01T21:00:00Z' },
      { start: '2026-07-01T21:00:00Z', end: '2026-07-02T21:00:00Z' },
    ],
    stations: [
      { id: 's1', code: 'A', lat: -1.2, lon: 36.6, x: 0, y: 0 },
      { id: 's2', code: 'B', lat: -1.2, lon: 36.61, x: 1000, y: 0 },
    ],
    individuals: [
      { id: 'i1', code: 'L1' },
      { id: 'i2', code: 'L2' },
    ],
    effort: [
      [0.75, 1],
      [0, 0],
    ],
    histories: ['11', '10'],
    detections: [
      [0, 0, 0, 1],
      [0, 1, 0, 1],
      [1, 0, 0, 1],
    ],
    sightingIds: ['a', 'b', 'c'],
  },
};

describe('SessionBuilder', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SessionBuilder],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideCharts(),
        provideRouter([]),
      ],
    });
    TestBed.inject(ProjectStore).current.set({
      slug: 'demo',
      timezone: 'Africa/Nairobi',
    } as ProjectDetail);
  });
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  async function ready() {
    const fixture = TestBed.createComponent(SessionBuilder);
    // whenStable waits for the resource, so the defaults are answered first.
    fixture.detectChanges();
    TestBed.inject(HttpTestingController)
      .expectOne('/api/projects/demo/sessions/defaults')
      .flush(DEFAULTS);
    await fixture.whenStable();
    return { fixture, root: fixture.nativeElement as HTMLElement };
  }

  const click = (root: HTMLElement, text: string) =>
    [...root.querySelectorAll('button')].find((b) => b.textContent?.trim() === text)!.click();

  it('should start from the deployments span and send local days as UTC bounds', async () => {
    const { fixture, root } = await ready();
    expect(root.querySelector<HTMLInputElement>('[data-testid=first-day]')!.value).toBe(
      '2026-07-01',
    );
    click(root, 'Build session');
    const req = TestBed.inject(HttpTestingController).expectOne(
      '/api/projects/demo/sessions/preview',
    );
    // Nairobi is UTC+3: local midnight of 1 July is 21:00 UTC on 30 June; the last day is included.
    expect(req.request.body).toEqual({
      start: '2026-06-30T21:00:00Z',
      end: '2026-08-29T21:00:00Z',
      stationIds: null,
      occasionHours: 24,
      flankPolicy: 'left',
      minQuality: 'fair',
      closurePeriodDays: 90,
    });
    req.flush(PREVIEW);
    await new Promise((r) => setTimeout(r, 20));
    await fixture.whenStable();
    expect(root.querySelector('[data-testid=session-summary]')?.textContent).toContain(
      '2 individuals',
    );
    expect(root.textContent).toContain('Confirmed sightings left out: 1 by the flank policy.');
    expect(root.textContent).toContain('Station(s) B had no working camera');
    // ngx-echarts draws after its own initialisation tick.
    await new Promise((r) => setTimeout(r, 20));
    await fixture.whenStable();
    expect(root.querySelector('[data-testid=effort-heatmap] svg')).not.toBeNull();
    expect(root.querySelector('[data-testid=history-heatmap] svg')).not.toBeNull();
  });

  it('should warn past the closure period before anything is sent', async () => {
    const { fixture, root } = await ready();
    const last = root.querySelector<HTMLInputElement>('[data-testid=last-day]')!;
    last.value = '2026-10-15';
    last.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(root.querySelector('[data-testid=closure-warning]')?.textContent).toContain(
      'lasts 107 days, longer than the 90-day closure period',
    );
  });
});
