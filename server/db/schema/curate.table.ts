/**
 * One change to who is who: a merge, a split, a resolved dispute, or the undo of one. `payload`
 * records exactly what moved, enough to reverse it; `individuals` lists every individual touched.
 */
export interface IdentityChangesTable {
  id: string;
  project_id: string;
  kind: string;
  by: string | null;
  at: string;
  reason: string;
  individuals: string;
  payload: string;
  undoes: string | null;
  undone_by: string | null;
}

/** A pair of individuals a curator said are not the same animal (never suggested again). */
export interface DuplicateDismissalsTable {
  project_id: string;
  first_id: string;
  second_id: string;
  by: string | null;
  at: string;
  reason: string;
}
