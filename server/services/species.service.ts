import { SPECIES_CATALOG } from '../../shared/species-catalog';
import type { SpeciesEntry } from '../../shared/sort';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { recordAudit } from './audit.service';

/** The project's quick-pick species, target first; a new project starts with the target only. */
export async function projectSpecies(db: Db, project: ProjectsTable): Promise<SpeciesEntry[]> {
  const rows = await db
    .selectFrom('project_species')
    .select(['scientific_name', 'common_name'])
    .where('project_id', '=', project.id)
    .orderBy('position')
    .execute();
  const list: SpeciesEntry[] = [
    {
      scientific: project.target_species_scientific,
      common: project.target_species_common,
      target: true,
    },
  ];
  for (const r of rows) {
    if (r.scientific_name !== project.target_species_scientific) {
      list.push({ scientific: r.scientific_name, common: r.common_name, target: false });
    }
  }
  return list;
}

/** Replaces the quick-pick list (order = quick keys). */
export async function setProjectSpecies(
  db: Db,
  project: ProjectsTable,
  species: { scientific: string; common: string }[],
  actorId: string,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    await trx.deleteFrom('project_species').where('project_id', '=', project.id).execute();
    let position = 0;
    for (const s of species) {
      await trx
        .insertInto('project_species')
        .values({
          project_id: project.id,
          scientific_name: s.scientific,
          common_name: s.common,
          position: position++,
        })
        .onConflict((oc) => oc.doNothing())
        .execute();
    }
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'set-species',
      entity: 'project',
      entityId: project.id,
      after: species,
    });
  });
}

/** True when a species name is known to the project or the built-in catalogue. */
export async function isKnownSpecies(
  db: Db,
  project: ProjectsTable,
  scientific: string,
): Promise<boolean> {
  if (scientific === project.target_species_scientific) return true;
  if (SPECIES_CATALOG.some((s) => s.scientific === scientific)) return true;
  const row = await db
    .selectFrom('project_species')
    .select('scientific_name')
    .where('project_id', '=', project.id)
    .where('scientific_name', '=', scientific)
    .executeTakeFirst();
  return Boolean(row);
}
