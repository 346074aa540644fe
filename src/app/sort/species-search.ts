import Fuse from 'fuse.js';
import { SPECIES_CATALOG } from '../../../shared/species-catalog';
import type { SpeciesEntry } from '../../../shared/sort';

/** A species the picker can offer. */
export interface SpeciesOption {
  scientific: string;
  common: string;
}

/** Searches the project's list and the built-in catalogue by common or scientific name. */
export class SpeciesSearch {
  private readonly fuse: Fuse<SpeciesOption>;
  private readonly all: SpeciesOption[];

  constructor(projectList: SpeciesEntry[]) {
    const seen = new Set<string>();
    this.all = [...projectList, ...SPECIES_CATALOG].filter(
      (s) => !seen.has(s.scientific) && seen.add(s.scientific),
    );
    this.fuse = new Fuse(this.all, {
      keys: ['common', 'scientific'],
      threshold: 0.35,
      ignoreLocation: true,
    });
  }

  /** Best matches first; an empty query gives nothing (the quick list is shown instead). */
  find(query: string, limit = 8): SpeciesOption[] {
    const q = query.trim();
    if (!q) return [];
    return this.fuse.search(q, { limit }).map((r) => r.item);
  }
}
