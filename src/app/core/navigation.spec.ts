import { navFor, PROJECT_NAV } from './navigation';

describe('navFor', () => {
  it('should give a volunteer only the field pages and the team', () => {
    expect(navFor('volunteer').map((i) => i.label)).toEqual([
      'Overview',
      'Stations',
      'Card uploads',
      'Team',
    ]);
  });

  it('should add Sort, Identify and Catalogue for reviewers, Curate for curators', () => {
    const reviewer = navFor('reviewer').map((i) => i.path);
    expect(reviewer).toContain('identify');
    expect(reviewer).not.toContain('curate');
    expect(navFor('curator').map((i) => i.path)).toContain('curate');
    expect(navFor('curator').map((i) => i.path)).not.toContain('estimates');
  });

  it('should give ecologists every area', () => {
    expect(navFor('ecologist')).toEqual([...PROJECT_NAV]);
  });

  it('should give a non-member nothing, and an admin without a role only the team page', () => {
    expect(navFor(null)).toEqual([]);
    expect(navFor(null, true).map((i) => i.path)).toEqual(['team']);
  });
});
