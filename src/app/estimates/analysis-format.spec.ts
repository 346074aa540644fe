import type { FreezeStatus, SessionParameters } from '../../../shared/analyses';
import { describeSession, freezeMessage, localDay, occasionLength } from './analysis-format';

const PARAMS: SessionParameters = {
  start: '2026-06-30T21:00:00Z',
  end: '2026-08-29T21:00:00Z',
  stationIds: null,
  occasionHours: 72,
  flankPolicy: 'both-linked',
  minQuality: 'fair',
  closurePeriodDays: 90,
};

const FREEZE: FreezeStatus = {
  hash: 'a'.repeat(64),
  currentHash: 'a'.repeat(64),
  matches: true,
  problem: null,
  changesSince: [],
  checkedAt: '2026-09-01T00:00:00Z',
};

const change = {
  id: 'c1',
  kind: 'merge',
  at: '2026-09-01T00:00:00Z',
  reason: 'x',
  individuals: [],
};

describe('analysis descriptions', () => {
  it('should describe the session in the project time zone', () => {
    const lines = describeSession(PARAMS, 'Africa/Nairobi', 20);
    expect(lines[0]).toEqual({
      label: 'Session',
      value: '2026-07-01 00:00 to 2026-08-30 00:00 (Africa/Nairobi), 60 days',
    });
    expect(lines.find((l) => l.label === 'Occasions')?.value).toBe('72 h (3 days pooled)');
    expect(lines.find((l) => l.label === 'Stations')?.value).toBe(
      'all stations of the project (20)',
    );
    expect(lines.find((l) => l.label === 'Flank policy')?.value).toContain(
      'Both-flank-linked individuals only.',
    );
    expect(lines.find((l) => l.label === 'Photo quality')?.value).toBe(
      'fair or better (good, fair)',
    );
  });

  it('should name occasion lengths and local days', () => {
    expect(occasionLength(24)).toBe('24 h (1 day)');
    expect(occasionLength(12)).toBe('12 h');
    expect(localDay('2026-06-30T21:00:00Z', 'Africa/Nairobi')).toBe('2026-07-01');
  });

  it('should say nothing when the freeze matches and nobody touched its individuals', () => {
    expect(freezeMessage(FREEZE)).toBeNull();
  });

  it('should say the catalogue changed when the hashes differ', () => {
    const m = freezeMessage({
      ...FREEZE,
      currentHash: 'b'.repeat(64),
      matches: false,
      changesSince: [change],
    });
    expect(m?.changed).toBe(true);
    expect(m?.title).toBe('The catalogue has changed since this analysis was saved');
    expect(m?.text).toContain('1 identity change (merge, split or undo) touched its individuals');
  });

  it('should reassure when changes were undone and the freeze matches again', () => {
    const m = freezeMessage({
      ...FREEZE,
      changesSince: [change, { ...change, id: 'c2', kind: 'undo' }],
    });
    expect(m).toEqual({
      changed: false,
      title: 'The data freeze still matches',
      text: '2 identity changes (merge, split or undo) touched its individuals since it was saved, but rebuilt today the inputs are identical to the data freeze.',
    });
  });
});
