import {
  effortPieces,
  heatmapCells,
  historyPieces,
  occasionDays,
  occasionTitles,
} from './heatmap-data';

describe('heatmap data', () => {
  it('should list every cell as column, row, value with row 0 first', () => {
    expect(
      heatmapCells([
        [0.75, 1],
        [0, 0.5],
      ]),
    ).toEqual([
      [0, 0, 0.75],
      [1, 0, 1],
      [0, 1, 0],
      [1, 1, 0.5],
    ]);
  });

  it('should give "not working" its own band, apart from partial and whole occasions', () => {
    const [off, part, whole] = effortPieces(2);
    expect(off).toMatchObject({ value: 0, label: 'not working' });
    expect(part).toMatchObject({ gt: 0, lt: 2 });
    expect(whole).toMatchObject({ gte: 2, label: 'whole occasion (2 d)' });
    expect(historyPieces().map((p) => p.label)).toEqual(['not detected', 'detected']);
  });

  it('should express occasion lengths in days and title occasions by number and day', () => {
    expect(occasionDays(72)).toBe(3);
    expect(occasionDays(12)).toBe(0.5);
    expect(
      occasionTitles(
        [{ start: '2026-07-01T00:00:00Z' }, { start: '2026-07-02T00:00:00Z' }],
        (iso) => iso.slice(0, 10),
      ),
    ).toEqual(['1 · 2026-07-01', '2 · 2026-07-02']);
  });
});
