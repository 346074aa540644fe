import type { AnalysisResults, RerunComparison } from '../../../shared/analyses';
import { comparisonRows } from './rerun-comparison';

// Shaped like the server's comparison; the numbers are made up for the table, not estimates.
const RESULTS = { summary: {}, warnings: [] } as unknown as AnalysisResults;
const CMP: RerunComparison = {
  savedHash: 'a',
  currentHash: 'b',
  changed: true,
  saved: RESULTS,
  current: RESULTS,
  currentInputs: {} as RerunComparison['currentInputs'],
  differences: {
    S: { before: 5, after: 4, change: -1 },
    detections: { before: 9, after: 9, change: 0 },
    sightings: { before: 10, after: 10, change: 0 },
    occasions: { before: 4, after: 4, change: 0 },
    densityPer100km2: { before: null, after: null, change: null },
    models: [
      { model: 'M0', before: 6.12, after: 4.98, change: -1.14 },
      { model: 'Mb', before: null, after: 5.5, change: null },
    ],
    individualsAppeared: [],
    individualsDisappeared: [{ id: 'x', code: 'SYN-6' }],
    sightingsAppeared: [],
    sightingsDisappeared: [],
  },
};

describe('comparisonRows', () => {
  it('should show S one lower with a signed change and mark it changed', () => {
    const rows = comparisonRows(CMP);
    expect(rows[0]).toEqual({
      label: 'Individuals caught (S)',
      before: '5',
      after: '4',
      change: '−1',
      changed: true,
    });
    expect(rows[1]).toMatchObject({ label: 'Detections', change: 'no change', changed: false });
  });

  it('should list each model with before and after, and a dash where one side has no estimate', () => {
    const rows = comparisonRows(CMP);
    expect(rows.find((r) => r.label.startsWith('N̂ M0'))).toMatchObject({
      before: '6.1',
      after: '5.0',
      change: '−1.1',
      changed: true,
    });
    expect(rows.find((r) => r.label.startsWith('N̂ Mb'))).toMatchObject({
      before: '—',
      after: '5.5',
      change: '—',
      changed: true,
    });
    expect(rows.find((r) => r.label.startsWith('SECR'))).toMatchObject({
      before: '—',
      changed: false,
    });
  });
});
