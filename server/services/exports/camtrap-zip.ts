import { existsSync } from 'node:fs';
import type { Response } from 'express';
import yazl from 'yazl';
import type { Db } from '../../db/database';
import type { PhotoStorage } from '../../images/storage';
import {
  CAMTRAP_FIELDS,
  REFERENCE_FIELDS,
  SIGHTING_FIELDS,
  dataPackage,
  toCsv,
} from './camtrap-tables';
import type { ExportModel } from './export-model';

/** The tables of a Camtrap DP package as text, keyed by file name. */
export async function packageFiles(
  db: Db,
  model: ExportModel,
  created?: string,
): Promise<Record<string, string>> {
  const ecologists = await db
    .selectFrom('memberships')
    .innerJoin('users', 'users.id', 'memberships.user_id')
    .select('users.name')
    .where('memberships.project_id', '=', model.project.id)
    .where('memberships.role', '=', 'ecologist')
    .orderBy('users.name')
    .execute();
  const contributors = ecologists.map((e) => ({ title: e.name, role: 'principalInvestigator' }));
  const strip = (rows: ExportModel['media']) =>
    rows.map(({ storedPath: _s, sha256: _h, ...row }) => row);
  return {
    'datapackage.json': `${JSON.stringify(dataPackage(model, contributors, created), null, 2)}\n`,
    'deployments.csv': toCsv(CAMTRAP_FIELDS.deployments, model.deployments),
    'media.csv': toCsv(CAMTRAP_FIELDS.media, strip(model.media)),
    'observations.csv': toCsv(CAMTRAP_FIELDS.observations, model.observations),
    'individual-sightings.csv': toCsv(SIGHTING_FIELDS, model.sightings),
    'individual-references.csv': toCsv(REFERENCE_FIELDS, model.references),
  };
}

/**
 * Streams a Camtrap DP zip: the tables, a short README, and the media files. A public export
 * carries the metadata-free 1600 px previews (never originals, whose EXIF holds exact GPS); a
 * private backup carries the originals.
 */
export async function streamCamtrapZip(
  db: Db,
  storage: PhotoStorage,
  model: ExportModel,
  res: Response,
  withMedia: boolean,
): Promise<void> {
  const files = await packageFiles(db, model);
  const zip = new yazl.ZipFile();
  for (const [name, text] of Object.entries(files)) zip.addBuffer(Buffer.from(text, 'utf8'), name);
  const r = model.report;
  const readme = [
    `Camtrap DP 1.0.2 package of "${model.project.name}" (${model.profile} profile), made by Maculo.`,
    model.profile === 'public'
      ? 'Public profile: coordinates generalised to the project precision; sensitive sites and photos and observations of people and vehicles are left out; media are metadata-free previews.'
      : 'PRIVATE BACKUP: exact coordinates and photos of people (filePublic = false). Do not publish.',
    `Sensitive sites left out: ${r.withheldDeployments.length}. Photos without a usable time left out: ${r.skippedMedia}. Photos of people or vehicles left out: ${r.privateMedia}.`,
    withMedia
      ? 'Media files are under media/.'
      : 'Media files are not included (their paths are listed in media.csv).',
  ].join('\n\n');
  zip.addBuffer(Buffer.from(`${readme}\n`, 'utf8'), 'README.txt');
  if (withMedia) {
    for (const m of model.media) {
      if (!m.storedPath) continue;
      const source =
        model.profile === 'public'
          ? storage.derivedPath(m.sha256, 'preview')
          : storage.absolute(m.storedPath);
      if (existsSync(source)) zip.addFile(source, String(m['filePath']));
    }
  }
  zip.end();
  res.set({
    'Content-Type': 'application/zip',
    'Content-Disposition': `attachment; filename="${model.project.slug}-camtrap-dp-${model.profile}.zip"`,
  });
  await new Promise<void>((resolve, reject) => {
    zip.outputStream.on('error', reject).pipe(res).on('finish', resolve).on('error', reject);
  });
}
