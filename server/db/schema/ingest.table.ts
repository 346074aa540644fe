/** A camera station (one or two camera locations). */
export interface StationsTable {
  id: string;
  project_id: string;
  code: string;
  name: string;
  lat: number;
  lon: number;
  notes: string;
  created_at: string;
}

/** One camera at one station for one period. */
export interface DeploymentsTable {
  id: string;
  project_id: string;
  station_id: string;
  camera_label: string;
  camera_serial: string | null;
  start: string;
  end: string;
  timezone: string;
  clock_offset_seconds: number;
  last_working: string | null;
  feature_type: string | null;
  bait_use: number;
  notes: string;
  clock_fix: string | null;
  camera_model?: string | null;
  created_by: string | null;
  created_at: string;
}

/** One upload of one memory card (may span several requests). */
export interface CardUploadsTable {
  id: string;
  project_id: string;
  deployment_id: string;
  uploader_id: string | null;
  accepted: number;
  duplicate: number;
  rejected: number;
  created_at: string;
}

/** Each file's verdict within a card upload. */
export interface UploadFilesTable {
  id: string;
  upload_id: string;
  seq: number;
  name: string;
  status: string;
  code: string | null;
  message: string | null;
  photo_id: string | null;
}

/** A stored photo; the bytes live once per SHA-256 under uploads/. */
export interface PhotosTable {
  id: string;
  project_id: string;
  deployment_id: string;
  upload_id: string;
  sha256: string;
  original_name: string;
  stored_path: string;
  bytes: number;
  width: number;
  height: number;
  taken_at_exif: string | null;
  taken_at: string | null;
  gps_lat: number | null;
  gps_lon: number | null;
  make: string | null;
  model: string | null;
  serial: string | null;
  status: string;
  error: string | null;
  flags: string;
  exif_thumb: number;
  event_id: string | null;
  created_at: string;
}

/** The durable processing queue. */
export interface JobsTable {
  id: string;
  kind: string;
  payload: string;
  status: string;
  attempts: number;
  max_attempts: number;
  run_after: string;
  locked_at: string | null;
  error: string | null;
  created_at: string;
  updated_at: string;
}

/** A group of photos at one station within the independence interval. */
export interface EventsTable {
  id: string;
  project_id: string;
  station_id: string;
  start: string;
  end: string;
  photo_count: number;
  created_at: string;
  label: string | null;
  species: string | null;
  animal_count: number | null;
  sorted_by: string | null;
  sorted_at: string | null;
  label_version: number;
  lease_holder: string | null;
  lease_until: string | null;
}
