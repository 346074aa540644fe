import { SENSITIVE_FEATURES, type FeatureType } from '../../../shared/stations';
import type { Db } from '../../db/database';
import type { ProjectsTable } from '../../db/schema/projects.table';
import { activeWindow } from '../effort';
import { exportPolicy, placeUnder, type CoordinatePolicy } from './coordinates';
import { isoWithOffset } from './time-zones';

/** A table row with Camtrap DP field names. */
export type Row = Record<string, string | number | boolean | null>;

/** Everything an export needs, already filtered and generalised for its profile. */
export interface ExportModel {
  project: ProjectsTable;
  profile: 'public' | 'private';
  policy: CoordinatePolicy;
  deployments: Row[];
  media: (Row & { storedPath: string; sha256: string })[];
  observations: Row[];
  sightings: Row[];
  /** Reference photos of active individuals (our second extension table). */
  references: Row[];
  species: { scientific: string; common: string }[];
  temporal: { start: string; end: string } | null;
  report: {
    withheldDeployments: string[];
    skippedMedia: number;
    privateMedia: number;
    excludedObservations: number;
  };
}

/** A comparator on a time cut to the second, then on the id. */
function bySecondThenId<T>(
  time: (x: T) => string,
  id: (x: T) => string = (x) => (x as { id: string }).id,
) {
  return (a: T, b: T) => {
    const [ta, tb] = [Date.parse(time(a)) / 1000, Date.parse(time(b)) / 1000].map(Math.floor) as [
      number,
      number,
    ];
    return ta - tb || (id(a) < id(b) ? -1 : id(a) > id(b) ? 1 : 0);
  };
}

const ROLE_BELOW: Record<string, 'adult' | 'subadult' | 'juvenile' | null> = {
  adult: 'adult',
  subadult: 'subadult',
  juvenile: 'juvenile',
  unknown: null,
};

/**
 * Collects a project's data for Camtrap DP, Darwin Core and spreadsheets. The public profile
 * generalises coordinates, leaves out sensitive sites (unless asked for knowingly), and drops
 * people and vehicles with their photos; the private profile keeps everything and marks photos of
 * people `filePublic = false`.
 */
export async function buildExportModel(
  db: Db,
  project: ProjectsTable,
  profile: 'public' | 'private',
  includeSensitiveSites: boolean,
): Promise<ExportModel> {
  const policy = exportPolicy(project, profile);
  const stations = new Map(
    (
      await db.selectFrom('stations').selectAll().where('project_id', '=', project.id).execute()
    ).map((s) => [s.id, s]),
  );
  const allDeployments = await db
    .selectFrom('deployments')
    .selectAll()
    .where('project_id', '=', project.id)
    .orderBy('start')
    .orderBy('id')
    .execute();
  const withheldDeployments = allDeployments
    .filter(
      (d) => !includeSensitiveSites && SENSITIVE_FEATURES.includes(d.feature_type as FeatureType),
    )
    .map((d) => d.id);
  const deployments = allDeployments.filter((d) => !withheldDeployments.includes(d.id));
  const included = new Set(deployments.map((d) => d.id));
  const photos = await db
    .selectFrom('photos')
    .leftJoin('events', 'events.id', 'photos.event_id')
    .select([
      'photos.id',
      'photos.deployment_id',
      'photos.taken_at',
      'photos.original_name',
      'photos.stored_path',
      'photos.sha256',
      'photos.flags',
      'photos.status',
      'photos.make',
      'photos.model',
      'events.label',
    ])
    .where('photos.project_id', '=', project.id)
    .orderBy('photos.taken_at')
    .orderBy('photos.id')
    .execute();
  const referenceRows = await db
    .selectFrom('reference_photos')
    .innerJoin('individuals', 'individuals.id', 'reference_photos.individual_id')
    .select(['individuals.code', 'reference_photos.photo_id', 'reference_photos.flank'])
    .where('individuals.project_id', '=', project.id)
    .where('individuals.status', '=', 'active')
    .orderBy('individuals.code')
    .orderBy('reference_photos.flank')
    .orderBy('reference_photos.position')
    .execute();
  const favourites = new Set(referenceRows.map((r) => r.photo_id));
  const zoneOf = new Map(deployments.map((d) => [d.id, d.timezone]));
  const report = { withheldDeployments, skippedMedia: 0, privateMedia: 0, excludedObservations: 0 };
  const hidden = (label: string | null) =>
    profile === 'public' && (label === 'human' || label === 'vehicle');

  const media: ExportModel['media'] = [];
  const models = new Map<string, string>();
  for (const p of photos) {
    if (!included.has(p.deployment_id)) continue;
    // Records imported without their file stay listed (their file is simply not in the zip).
    if (!p.taken_at || p.status === 'purged' || (!p.stored_path && p.status !== 'external')) {
      report.skippedMedia++;
      continue;
    }
    if (p.make || p.model) models.set(p.deployment_id, [p.make, p.model].filter(Boolean).join(' '));
    if (hidden(p.label)) {
      report.privateMedia++;
      continue;
    }
    const filePublic = p.label !== 'human';
    media.push({
      mediaID: p.id,
      deploymentID: p.deployment_id,
      captureMethod: 'activityDetection',
      timestamp: isoWithOffset(p.taken_at, zoneOf.get(p.deployment_id)!),
      filePath: `media/${p.deployment_id}/${p.id}.jpg`,
      filePublic,
      fileName: p.original_name,
      fileMediatype: 'image/jpeg',
      exifData: null,
      favorite: favourites.has(p.id),
      mediaComments: (JSON.parse(p.flags) as string[]).join('|') || null,
      storedPath: p.stored_path,
      sha256: p.sha256,
    });
  }

  media.sort(
    bySecondThenId(
      (m) => String(m['timestamp']),
      (m) => String(m['mediaID']),
    ),
  );
  const deploymentRows: Row[] = deployments.map((d) => {
    const s = stations.get(d.station_id)!;
    const where = placeUnder(policy, s.lat, s.lon);
    const [start, end] = activeWindow(d);
    const unfixedReset =
      !d.clock_fix &&
      photos.some((p) => p.deployment_id === d.id && p.flags.includes('clock_reset_suspected'));
    return {
      deploymentID: d.id,
      locationID: s.id,
      locationName: s.code,
      latitude: where.lat,
      longitude: where.lon,
      coordinateUncertainty: where.uncertainty,
      deploymentStart: isoWithOffset(new Date(start).toISOString(), d.timezone),
      deploymentEnd: isoWithOffset(new Date(end).toISOString(), d.timezone),
      setupBy: null,
      cameraID: d.camera_serial,
      cameraModel: d.camera_model ?? models.get(d.id) ?? null,
      cameraDelay: null,
      cameraHeight: null,
      cameraDepth: null,
      cameraTilt: null,
      cameraHeading: null,
      detectionDistance: null,
      timestampIssues: unfixedReset,
      baitUse: d.bait_use === 1,
      featureType: d.feature_type,
      habitat: null,
      deploymentGroups: null,
      deploymentTags: `camera:${d.camera_label}`,
      deploymentComments: d.notes || null,
    };
  });
  const { observations, sightings, species, temporal } = await buildObservations(
    db,
    project,
    included,
    zoneOf,
    hidden,
    report,
  );
  const exported = new Set(media.map((m) => m.mediaID));
  const references = referenceRows
    .filter((r) => r.code && exported.has(r.photo_id))
    .map((r) => ({ individualID: r.code, mediaID: r.photo_id, flank: r.flank }));
  return {
    project,
    profile,
    policy,
    deployments: deploymentRows,
    media,
    observations,
    sightings,
    references,
    species,
    temporal,
    report,
  };
}

async function buildObservations(
  db: Db,
  project: ProjectsTable,
  included: Set<string>,
  zoneOf: Map<string, string>,
  hidden: (label: string | null) => boolean,
  report: ExportModel['report'],
) {
  // Ordered by the second the tables show (times are written to the second), then by id, so
  // that a re-imported package lists its rows in the same order.
  const events = (
    await db.selectFrom('events').selectAll().where('project_id', '=', project.id).execute()
  ).sort(bySecondThenId((e) => e.start));
  // The camera of an event's first photo (to the second, then by id) is the observation's deployment.
  const firstPhoto = new Map(
    (
      await db
        .selectFrom('photos')
        .select(['id', 'event_id', 'deployment_id', 'taken_at'])
        .where('project_id', '=', project.id)
        .where('event_id', 'is not', null)
        .where('taken_at', 'is not', null)
        .execute()
    )
      .sort(bySecondThenId((p) => p.taken_at!))
      .reverse()
      .map((p) => [p.event_id!, p.deployment_id]),
  );
  const sightingRows = await db
    .selectFrom('sightings')
    .innerJoin('photos', 'photos.id', 'sightings.best_photo_id')
    .leftJoin('individuals', 'individuals.id', 'sightings.individual_id')
    .select([
      'sightings.id',
      'sightings.event_id',
      'sightings.flank',
      'sightings.quality',
      'sightings.state',
      'sightings.sex',
      'sightings.age_class',
      'sightings.best_photo_id',
      'sightings.crop',
      'sightings.imported_review',
      'photos.deployment_id',
      'individuals.code',
      'individuals.status',
    ])
    .where('sightings.project_id', '=', project.id)
    .orderBy('sightings.id')
    .execute();
  const calls = await db
    .selectFrom('calls')
    .select(['sighting_id', 'verdict'])
    .where('project_id', '=', project.id)
    .execute();
  const decided = new Set(
    (
      await db
        .selectFrom('identity_changes')
        .select('payload')
        .where('project_id', '=', project.id)
        .where('kind', '=', 'resolve')
        .where('undone_by', 'is', null)
        .execute()
    ).map((c) => (JSON.parse(c.payload) as { sighting: string }).sighting),
  );
  const observations: Row[] = [];
  const sightings: Row[] = [];
  const species = new Map<string, string>();
  let start = null as string | null;
  let end = null as string | null;
  for (const e of events) {
    const deployment = firstPhoto.get(e.id);
    if (!deployment || !included.has(deployment)) continue;
    if (hidden(e.label)) {
      report.excludedObservations++;
      continue;
    }
    const zone = zoneOf.get(deployment)!;
    const base = {
      eventID: e.id,
      eventStart: isoWithOffset(e.start, zone),
      eventEnd: isoWithOffset(e.end, zone),
      observationLevel: 'event',
      observationType: e.label ?? 'unclassified',
      cameraSetupType: null,
      scientificName: e.species,
      classificationMethod: e.label ? 'human' : null,
      classificationTimestamp: e.sorted_at ? isoWithOffset(e.sorted_at, zone) : null,
    };
    start = start !== null && start < e.start ? start : e.start;
    end = end !== null && end > e.end ? end : e.end;
    if (e.species) species.set(e.species, e.species);
    const own = sightingRows.filter((s) => s.event_id === e.id && included.has(s.deployment_id));
    if (e.label === 'animal' && e.species === project.target_species_scientific && own.length) {
      for (const s of own) {
        const identified = s.state === 'confirmed' && s.status === 'active' ? s.code : null;
        observations.push({
          observationID: s.id,
          deploymentID: s.deployment_id,
          mediaID: null,
          ...base,
          count: 1,
          lifeStage: ROLE_BELOW[s.age_class ?? 'unknown'] ?? null,
          sex: s.sex === 'female' || s.sex === 'male' ? s.sex : null,
          individualID: identified,
          classificationProbability: s.state === 'confirmed' ? 1 : null,
          observationComments: null,
        });
        const mine = calls.filter((c) => c.sighting_id === s.id);
        const imported =
          s.imported_review && mine.length === 0
            ? (JSON.parse(s.imported_review) as { agreement: string; calls: number })
            : null;
        sightings.push({
          observationID: s.id,
          flank: s.flank,
          photoQuality: s.quality,
          reviewState: s.state,
          reviewAgreement:
            imported?.agreement ??
            (s.state === 'disputed'
              ? 'disputed'
              : decided.has(s.id)
                ? 'curator-decided'
                : mine.length >= 2
                  ? 'two-reviewers-agree'
                  : mine.length === 1
                    ? 'single-review'
                    : 'not-reviewed'),
          calls: imported?.calls ?? mine.length,
          bestMediaID: s.best_photo_id,
          crop: s.crop,
        });
      }
      continue;
    }
    observations.push({
      observationID: e.id,
      deploymentID: deployment,
      mediaID: null,
      ...base,
      count: e.label === 'animal' ? (e.animal_count ?? 1) : null,
      lifeStage: null,
      sex: null,
      individualID: null,
      classificationProbability: null,
      observationComments: null,
    });
  }
  const names = await db
    .selectFrom('project_species')
    .select(['scientific_name', 'common_name'])
    .where('project_id', '=', project.id)
    .execute();
  const common = new Map(names.map((n) => [n.scientific_name, n.common_name]));
  common.set(project.target_species_scientific, project.target_species_common);
  return {
    observations,
    sightings,
    species: [...species.keys()]
      .sort()
      .map((s) => ({ scientific: s, common: common.get(s) ?? '' })),
    temporal: start && end ? { start: start.slice(0, 10), end: end.slice(0, 10) } : null,
  };
}
