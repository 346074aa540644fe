import { SpeciesSearch } from './species-search';

describe('SpeciesSearch', () => {
  const search = new SpeciesSearch([
    { scientific: 'Panthera pardus', common: 'Leopard', target: true },
    { scientific: 'Tragelaphus scriptus', common: 'Bushbuck', target: false },
  ]);

  it('should find species by common name despite a typo', () => {
    expect(search.find('spoted hyena')[0]?.scientific).toBe('Crocuta crocuta');
    expect(search.find('porcupin')[0]?.common).toMatch(/porcupine/i);
  });

  it('should find species by scientific name', () => {
    expect(search.find('Tragelaphus scriptus')[0]?.common).toBe('Bushbuck');
  });

  it('should offer nothing for an empty query and never list a species twice', () => {
    expect(search.find('  ')).toEqual([]);
    const leopards = search.find('leopard', 20).filter((s) => s.scientific === 'Panthera pardus');
    expect(leopards).toHaveLength(1);
  });
});
