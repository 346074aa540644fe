/** A catalogued animal: opaque id, display code once confirmed, and what it looks like. */
export interface IndividualsTable {
  id: string;
  project_id: string;
  code: string | null;
  nickname: string | null;
  sex: string;
  notes: string;
  tags: string;
  /** provisional (a first reviewer's "new"), active, merged, or discarded. */
  status: string;
  merged_into: string | null;
  created_by: string | null;
  created_at: string;
  updated_at: string;
}

/** Reference photos of an individual, per flank, in the curator's order. */
export interface ReferencePhotosTable {
  individual_id: string;
  flank: string;
  photo_id: string;
  position: number;
  chosen_by: string | null;
  created_at: string;
}

/** Old display codes that still lead to an individual (after merges). */
export interface AliasesTable {
  project_id: string;
  code: string;
  individual_id: string;
  change_id: string | null;
  created_at: string;
}

/** One reviewer's decision on a sighting. */
export interface CallsTable {
  id: string;
  project_id: string;
  sighting_id: string;
  reviewer_id: string;
  verdict: string;
  individual_id: string | null;
  note: string;
  created_at: string;
}
