import Papa from 'papaparse';
import type { ExportModel, Row } from './export-model';
import { generalizationText } from './coordinates';

/** Camtrap DP 1.0.2 field order of each table (the standard's table schemas). */
export const CAMTRAP_FIELDS = {
  deployments: [
    'deploymentID',
    'locationID',
    'locationName',
    'latitude',
    'longitude',
    'coordinateUncertainty',
    'deploymentStart',
    'deploymentEnd',
    'setupBy',
    'cameraID',
    'cameraModel',
    'cameraDelay',
    'cameraHeight',
    'cameraDepth',
    'cameraTilt',
    'cameraHeading',
    'detectionDistance',
    'timestampIssues',
    'baitUse',
    'featureType',
    'habitat',
    'deploymentGroups',
    'deploymentTags',
    'deploymentComments',
  ],
  media: [
    'mediaID',
    'deploymentID',
    'captureMethod',
    'timestamp',
    'filePath',
    'filePublic',
    'fileName',
    'fileMediatype',
    'exifData',
    'favorite',
    'mediaComments',
  ],
  observations: [
    'observationID',
    'deploymentID',
    'mediaID',
    'eventID',
    'eventStart',
    'eventEnd',
    'observationLevel',
    'observationType',
    'cameraSetupType',
    'scientificName',
    'count',
    'lifeStage',
    'sex',
    'behavior',
    'individualID',
    'individualPositionRadius',
    'individualPositionAngle',
    'individualSpeed',
    'bboxX',
    'bboxY',
    'bboxWidth',
    'bboxHeight',
    'classificationMethod',
    'classifiedBy',
    'classificationTimestamp',
    'classificationProbability',
    'observationTags',
    'observationComments',
  ],
} as const;

/** Our extension table, keyed on observationID: flank, photo quality and how the identity was agreed. */
export const SIGHTING_FIELDS = [
  'observationID',
  'flank',
  'photoQuality',
  'reviewState',
  'reviewAgreement',
  'calls',
  'bestMediaID',
  'crop',
] as const;

/** Our second extension table: the reference photos chosen for each individual, by flank. */
export const REFERENCE_FIELDS = ['individualID', 'mediaID', 'flank'] as const;

const SCHEMA_BASE = 'https://raw.githubusercontent.com/tdwg/camtrap-dp/1.0.2';

/** A table as CSV with a fixed field order; missing values are empty. */
export function toCsv(fields: readonly string[], rows: Row[]): string {
  return Papa.unparse(
    { fields: [...fields], data: rows.map((r) => fields.map((f) => r[f] ?? '')) },
    { newline: '\n' },
  );
}

function spatial(model: ExportModel) {
  const lats = model.deployments.map((d) => Number(d['latitude']));
  const lons = model.deployments.map((d) => Number(d['longitude']));
  if (!lats.length) return null;
  const [s, n, w, e] = [Math.min(...lats), Math.max(...lats), Math.min(...lons), Math.max(...lons)];
  return {
    type: 'Polygon',
    coordinates: [
      [
        [w, s],
        [e, s],
        [e, n],
        [w, n],
        [w, s],
      ],
    ],
  };
}

/** datapackage.json for a model (Camtrap DP 1.0.2 profile). */
export function dataPackage(
  model: ExportModel,
  contributors: { title: string; email?: string; role: string }[],
  created = new Date().toISOString(),
) {
  const p = model.project;
  const generalised = generalizationText(model.policy);
  return {
    profile: `${SCHEMA_BASE}/camtrap-dp-profile.json`,
    name: p.slug,
    id: p.id,
    created: created.replace(/\.\d{3}Z$/, 'Z'),
    title: p.name,
    description: [
      p.description,
      generalised && `Locations: ${generalised}.`,
      model.profile === 'public'
        ? 'Photos and observations of people and vehicles are not included.'
        : 'Private backup: exact locations; photos of people are marked filePublic = false and must not be published.',
    ]
      .filter(Boolean)
      .join(' '),
    version: '1.0',
    contributors: contributors.length ? contributors : [{ title: p.name, role: 'contact' }],
    licenses: [
      { name: 'CC-BY-4.0', scope: 'data' },
      { name: 'CC-BY-4.0', scope: 'media' },
    ],
    project: {
      id: p.id,
      title: p.name,
      description: p.description,
      samplingDesign: 'targeted',
      captureMethod: ['activityDetection'],
      individualAnimals: true,
      observationLevel: ['event'],
    },
    ...(model.policy.precision !== null ? { coordinatePrecision: model.policy.precision } : {}),
    spatial: spatial(model),
    temporal: model.temporal ?? {
      start: p.created_at.slice(0, 10),
      end: p.created_at.slice(0, 10),
    },
    taxonomic: model.species.map((s) => ({
      scientificName: s.scientific,
      ...(s.common ? { vernacularNames: { eng: s.common } } : {}),
    })),
    resources: [
      {
        name: 'deployments',
        path: 'deployments.csv',
        profile: 'tabular-data-resource',
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        schema: `${SCHEMA_BASE}/deployments-table-schema.json`,
      },
      {
        name: 'media',
        path: 'media.csv',
        profile: 'tabular-data-resource',
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        schema: `${SCHEMA_BASE}/media-table-schema.json`,
      },
      {
        name: 'observations',
        path: 'observations.csv',
        profile: 'tabular-data-resource',
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        schema: `${SCHEMA_BASE}/observations-table-schema.json`,
      },
      {
        name: 'individual-sightings',
        path: 'individual-sightings.csv',
        profile: 'tabular-data-resource',
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        schema: {
          fields: [
            {
              name: 'observationID',
              type: 'string',
              constraints: { required: true, unique: true },
            },
            {
              name: 'flank',
              type: 'string',
              constraints: { enum: ['left', 'right', 'both', 'front', 'back', 'unknown'] },
            },
            {
              name: 'photoQuality',
              type: 'string',
              constraints: { enum: ['good', 'fair', 'poor'] },
            },
            {
              name: 'reviewState',
              type: 'string',
              constraints: {
                enum: ['open', 'proposed', 'confirmed', 'disputed', 'unidentifiable'],
              },
            },
            { name: 'reviewAgreement', type: 'string' },
            { name: 'calls', type: 'integer' },
            { name: 'bestMediaID', type: 'string' },
            { name: 'crop', type: 'string' },
          ],
          primaryKey: ['observationID'],
          foreignKeys: [
            {
              fields: ['observationID'],
              reference: { resource: 'observations', fields: ['observationID'] },
            },
          ],
        },
      },
      {
        name: 'individual-references',
        path: 'individual-references.csv',
        profile: 'tabular-data-resource',
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        schema: {
          fields: [
            { name: 'individualID', type: 'string', constraints: { required: true } },
            { name: 'mediaID', type: 'string', constraints: { required: true } },
            {
              name: 'flank',
              type: 'string',
              constraints: { required: true, enum: ['left', 'right', 'other'] },
            },
          ],
          primaryKey: ['individualID', 'mediaID'],
          foreignKeys: [
            { fields: ['mediaID'], reference: { resource: 'media', fields: ['mediaID'] } },
          ],
        },
      },
    ],
  };
}
