import { sortKeyAction } from './sort-keys';

describe('sortKeyAction', () => {
  it('should give one key per label', () => {
    expect(sortKeyAction('b', 'label')).toEqual({ kind: 'label', label: 'blank' });
    expect(sortKeyAction('H', 'label')).toEqual({ kind: 'label', label: 'human' });
    expect(sortKeyAction('v', 'label')).toEqual({ kind: 'label', label: 'vehicle' });
    expect(sortKeyAction('u', 'label')).toEqual({ kind: 'label', label: 'unknown' });
    expect(sortKeyAction('t', 'label')).toEqual({ kind: 'target' });
    expect(sortKeyAction('a', 'label')).toEqual({ kind: 'pick-species' });
  });

  it('should move between photos and events and undo', () => {
    expect(sortKeyAction('ArrowRight', 'label')).toEqual({ kind: 'photo', step: 1 });
    expect(sortKeyAction('j', 'label')).toEqual({ kind: 'event', step: 1 });
    expect(sortKeyAction('ArrowUp', 'label')).toEqual({ kind: 'event', step: -1 });
    expect(sortKeyAction('z', 'label')).toEqual({ kind: 'undo' });
    expect(sortKeyAction('z', 'sighting', true)).toEqual({ kind: 'undo' });
  });

  it('should read digits as an animal count in label mode only', () => {
    expect(sortKeyAction('3', 'label')).toEqual({ kind: 'count', count: 3 });
    expect(sortKeyAction('3', 'sighting')).toEqual({ kind: 'none' });
  });

  it('should give the same letters other meanings while describing a sighting', () => {
    expect(sortKeyAction('l', 'sighting')).toEqual({ kind: 'flank', flank: 'left' });
    expect(sortKeyAction('o', 'sighting')).toEqual({ kind: 'flank', flank: 'both' });
    expect(sortKeyAction('a', 'sighting')).toEqual({ kind: 'quality', quality: 'fair' });
    expect(sortKeyAction('Enter', 'sighting')).toEqual({ kind: 'save-sighting' });
    expect(sortKeyAction('q', 'sighting')).toEqual({ kind: 'none' });
  });
});
