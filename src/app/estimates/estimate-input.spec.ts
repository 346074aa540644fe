import { parseCapturesCsv, parseCounts, parseHistoriesText, parseTrapsCsv } from './estimate-input';

describe('parseHistoriesText', () => {
  it('should read one 0/1 string per line and skip blank and comment lines', () => {
    const parsed = parseHistoriesText('# session 1\n0101\n\n  1100  \n0011\n');
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows.map((r) => r.history)).toEqual(['0101', '1100', '0011']);
    expect(parsed.rows.map((r) => r.line)).toEqual([2, 4, 5]);
  });

  it('should read CSV with an id column and a header, keeping numeric ids as labels', () => {
    const parsed = parseHistoriesText('id,o1,o2,o3\n101,1,0,1\n7,0,1,1\n');
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows).toEqual([
      { id: '101', history: '101', line: 2 },
      { id: '7', history: '011', line: 3 },
    ]);
  });

  it('should read labelled lines separated by spaces or semicolons', () => {
    const parsed = parseHistoriesText('A12 0 1 1\nB3;110\n');
    expect(parsed.rows.map((r) => [r.id, r.history])).toEqual([
      ['A12', '011'],
      ['B3', '110'],
    ]);
  });

  it('should name the line of a history with other characters, of unequal length, or all zeros', () => {
    const parsed = parseHistoriesText('0101\n01x1\n011\n0000\n');
    expect(parsed.problems).toEqual([
      'Line 2 ("01x1") has characters other than 0 and 1 in its history.',
      'Line 3 has 3 occasions but the first history has 4.',
      'Line 4 is all zeros: list only animals caught at least once.',
    ]);
  });

  it('should refuse a single occasion and an empty paste', () => {
    expect(parseHistoriesText('1\n1\n').problems).toContain(
      'A single occasion cannot estimate abundance: give at least two.',
    );
    expect(parseHistoriesText('  \n').problems).toEqual(['Paste at least two capture histories.']);
  });
});

describe('parseTrapsCsv', () => {
  it('should read id,x,y with or without a header, in the header’s order', () => {
    expect(parseTrapsCsv('T1,0,0\nT2,100,0\n').rows).toEqual([
      { id: 'T1', x: 0, y: 0 },
      { id: 'T2', x: 100, y: 0 },
    ]);
    expect(parseTrapsCsv('y;x;trap\n5;10;A\n6;20;B\n').rows).toEqual([
      { id: 'A', x: 10, y: 5 },
      { id: 'B', x: 20, y: 6 },
    ]);
  });

  it('should report a trap without coordinates and a repeated id by line', () => {
    const parsed = parseTrapsCsv('id,x,y\nT1,0,0\nT2,,50\nT1,5,5\n');
    expect(parsed.problems).toEqual([
      'Line 3: trap T2 has no usable x coordinate (metres).',
      'Line 4: trap id T1 is used twice.',
    ]);
  });
});

describe('parseCapturesCsv', () => {
  it('should read animal,occasion,trap and refuse unknown traps and bad occasions', () => {
    const parsed = parseCapturesCsv(
      'animal,occasion,trap\nL01,1,T1\nL01,2,T9\nL02,0,T1\n',
      new Set(['T1', 'T2']),
    );
    expect(parsed.rows).toEqual([{ animal: 'L01', occasion: 1, trap: 'T1' }]);
    expect(parsed.problems).toEqual([
      'Line 3: trap T9 is not in the trap list.',
      'Line 4: the occasion must be a whole number from 1.',
    ]);
  });
});

describe('parseCounts', () => {
  it('should read counts separated by commas, spaces and new lines', () => {
    expect(parseCounts('3, 1 4\n1;5').rows).toEqual([3, 1, 4, 1, 5]);
  });

  it('should refuse negative and fractional counts', () => {
    expect(parseCounts('3 -1 2.5').problems).toEqual([
      '"-1" is not a count: counts are whole numbers, 0 or more.',
      '"2.5" is not a count: counts are whole numbers, 0 or more.',
    ]);
  });
});
