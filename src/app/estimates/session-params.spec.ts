import {
  closureWarning,
  nextDay,
  sessionDays,
  sessionProblems,
  toSessionParams,
  type SessionFormValue,
} from './session-params';

const FORM: SessionFormValue = {
  firstDay: '2026-07-01',
  lastDay: '2026-08-29',
  allStations: true,
  stationIds: [],
  occasionHours: 24,
  flankPolicy: 'left',
  minQuality: 'fair',
  closurePeriodDays: 90,
};

describe('session form', () => {
  it('should turn local days into UTC bounds with the last day included', () => {
    // Nairobi is UTC+3 all year: local midnight is 21:00 UTC the day before.
    expect(toSessionParams(FORM, 'Africa/Nairobi')).toEqual({
      start: '2026-06-30T21:00:00Z',
      end: '2026-08-29T21:00:00Z',
      stationIds: null,
      occasionHours: 24,
      flankPolicy: 'left',
      minQuality: 'fair',
      closurePeriodDays: 90,
    });
    // Berlin keeps summer time (UTC+2) in July.
    expect(toSessionParams(FORM, 'Europe/Berlin').start).toBe('2026-06-30T22:00:00Z');
  });

  it('should send the chosen stations only when not all are wanted', () => {
    const chosen = { ...FORM, allStations: false, stationIds: ['a', 'b'] };
    expect(toSessionParams(chosen, 'UTC').stationIds).toEqual(['a', 'b']);
  });

  it('should count days with both ends included, across month ends and leap days', () => {
    expect(sessionDays(FORM)).toBe(60); // 31 days of July + 29 of August
    expect(sessionDays({ firstDay: '2028-02-28', lastDay: '2028-03-01' })).toBe(3);
    expect(nextDay('2026-12-31')).toBe('2027-01-01');
  });

  it('should warn past the closure period and not before', () => {
    expect(closureWarning({ ...FORM, lastDay: '2026-09-28' })).toBeNull(); // 90 days
    expect(closureWarning({ ...FORM, lastDay: '2026-09-29' })).toContain('lasts 91 days');
  });

  it('should name the problems before sending anything', () => {
    expect(sessionProblems(FORM)).toEqual([]);
    expect(
      sessionProblems({
        ...FORM,
        lastDay: '2026-06-01',
        allStations: false,
        occasionHours: 0,
      }),
    ).toEqual([
      'The last day cannot be before the first day.',
      'Choose at least one station.',
      'The occasion length is a whole number of hours from 1 to 720 (30 days).',
    ]);
  });
});
