/** The species a project's reviewers pick from first (quick keys follow the order). */
export interface ProjectSpeciesTable {
  project_id: string;
  scientific_name: string;
  common_name: string;
  position: number;
}

/** One animal of the target species in one event, waiting to be identified. */
export interface SightingsTable {
  id: string;
  project_id: string;
  event_id: string;
  flank: string;
  quality: string;
  best_photo_id: string;
  crop: string | null;
  sex: string | null;
  age_class: string | null;
  state: string;
  individual_id: string | null;
  created_by: string | null;
  created_at: string;
  updated_at: string;
  lease_holder: string | null;
  lease_until: string | null;
  /** For sightings imported from a package: the agreement and call count it recorded. */
  imported_review?: string | null;
}
