/** A survey project and its settings. */
export interface ProjectsTable {
  id: string;
  slug: string;
  name: string;
  description: string;
  target_species_scientific: string;
  target_species_common: string;
  timezone: string;
  independence_minutes: number;
  occasion_hours: number;
  reviewers_per_sighting: number;
  sensitivity: string;
  sensitivity_review_date: string | null;
  code_prefix: string;
  code_next: number;
  created_at: string;
  created_by: string | null;
  boundary_geojson: string | null;
  tile_url: string | null;
  gps_tolerance_m: number;
  human_retention_days: number | null;
  last_digest_at: string | null;
}

/** A user's role in one project. */
export interface MembershipsTable {
  project_id: string;
  user_id: string;
  role: string;
  created_at: string;
}
