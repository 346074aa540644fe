/**
 * A saved analysis. `parameters`, `inputs` (the data freeze) and `results` are JSON; `freeze_hash`
 * is the SHA-256 of the canonical inputs. `status` is running while an SECR fit finishes.
 */
export interface AnalysesTable {
  id: string;
  project_id: string;
  name: string;
  parameters: string;
  freeze_hash: string;
  inputs: string;
  results: string;
  status: string;
  error: string | null;
  created_by: string | null;
  created_at: string;
  finished_at: string | null;
}
