import { identifyKeyAction } from './identify-keys';

describe('identifyKeyAction', () => {
  it('should give every verdict its own key', () => {
    expect(identifyKeyAction('m')).toBe('match');
    expect(identifyKeyAction('Enter')).toBe('match');
    expect(identifyKeyAction('N')).toBe('new');
    expect(identifyKeyAction('x')).toBe('unidentifiable');
    expect(identifyKeyAction('s')).toBe('skip');
  });

  it('should step through candidates and photos and control the compare view', () => {
    expect(identifyKeyAction('j')).toBe('next-candidate');
    expect(identifyKeyAction('ArrowUp')).toBe('previous-candidate');
    expect(identifyKeyAction('ArrowRight')).toBe('next-photo');
    expect(identifyKeyAction('f')).toBe('mirror');
    expect(identifyKeyAction('P')).toBe('matched-points');
    expect(identifyKeyAction('+')).toBe('zoom-in');
    expect(identifyKeyAction('0')).toBe('zoom-reset');
    expect(identifyKeyAction('/')).toBe('search');
  });

  it('should ignore keys it does not know', () => {
    expect(identifyKeyAction('q')).toBeNull();
    expect(identifyKeyAction('Tab')).toBeNull();
  });
});
