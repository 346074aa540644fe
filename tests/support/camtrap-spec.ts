import Papa from 'papaparse';

// Checks of a Camtrap DP 1.0.2 package, written from the standard's published field list as
// summarised in the handbook (field-practice.md §2.1–2.2, source [S1]: the 1.0.2 profile and table
// schemas). Enumerations marked "from memory" are the schema's full lists where the handbook only
// gives examples.

type Rows = Record<string, string>[];

/** One table of the standard: its fields in order, required ones, and each field's check. */
interface TableSpec {
  fields: string[];
  required: string[];
  primaryKey: string;
  checks: Record<string, (v: string) => string | null>;
}

// Datetime "%Y-%m-%dT%H:%M:%S%z" [S1]: seconds, and an offset (Z or ±hh:mm / ±hhmm).
const DATETIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(Z|[+-]\d{2}:?\d{2})$/;
const MISSING = ['', 'NA', 'NaN', 'nan']; // 1.0.2 missing values [S1 changelog]

const isMissing = (v: string | undefined) => v === undefined || MISSING.includes(v);
const numberIn = (lo: number, hi: number) => (v: string) =>
  Number.isFinite(Number(v)) && Number(v) >= lo && Number(v) <= hi
    ? null
    : `not a number in ${lo}..${hi}`;
const integerAtLeast = (lo: number) => (v: string) =>
  /^-?\d+$/.test(v) && Number(v) >= lo ? null : `not an integer >= ${lo}`;
const oneOf = (values: string[]) => (v: string) =>
  values.includes(v) ? null : `not one of ${values.join(', ')}`;
const datetime = (v: string) =>
  DATETIME.test(v) && !Number.isNaN(Date.parse(v)) ? null : 'not a datetime with offset';
const boolean = (v: string) => (v === 'true' || v === 'false' ? null : 'not true/false');
const text = () => null;

/** Relative paths must not start with `.`, `/` or `~` and must not contain `..` [S1]; URLs are allowed. */
export function filePathProblem(v: string): string | null {
  if (/^https?:\/\//.test(v)) return null;
  if (/^[./~]/.test(v)) return 'relative path starting with ., / or ~';
  if (v.includes('..')) return 'path containing ..';
  return null;
}

// featureType values (from memory: the full 1.0.2 enum; the handbook names burrow, nestSite,
// carcass, waterSource and trailGame among them).
const FEATURE_TYPE = [
  'roadPaved',
  'roadDirt',
  'trailHiking',
  'trailGame',
  'roadUnderpass',
  'roadOverpass',
  'roadBridge',
  'culvert',
  'burrow',
  'nestSite',
  'carcass',
  'waterSource',
  'fruitingTree',
];

export const CAMTRAP_1_0_2: Record<'deployments' | 'media' | 'observations', TableSpec> = {
  deployments: {
    fields: [
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
    required: ['deploymentID', 'latitude', 'longitude', 'deploymentStart', 'deploymentEnd'],
    primaryKey: 'deploymentID',
    checks: {
      latitude: numberIn(-90, 90),
      longitude: numberIn(-180, 180),
      coordinateUncertainty: integerAtLeast(1),
      deploymentStart: datetime,
      deploymentEnd: datetime,
      cameraDelay: integerAtLeast(0),
      cameraHeight: numberIn(0, 1e6),
      cameraDepth: numberIn(0, 1e6),
      cameraTilt: numberIn(-90, 90),
      cameraHeading: numberIn(0, 360),
      detectionDistance: numberIn(0, 1e6),
      timestampIssues: boolean,
      baitUse: boolean,
      featureType: oneOf(FEATURE_TYPE),
      deploymentTags: (v) =>
        v.split('|').every((t) => t.length > 0) ? null : 'empty tag in a pipe-separated list',
    },
  },
  media: {
    fields: [
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
    required: ['mediaID', 'deploymentID', 'timestamp', 'filePath', 'filePublic', 'fileMediatype'],
    primaryKey: 'mediaID',
    checks: {
      captureMethod: oneOf(['activityDetection', 'timeLapse']),
      timestamp: datetime,
      filePath: filePathProblem,
      filePublic: boolean,
      fileMediatype: (v) =>
        /^(image|video|audio)\/.*$/.test(v) ? null : 'not image/, video/ or audio/',
      exifData: (v) => {
        try {
          JSON.parse(v);
          return null;
        } catch {
          return 'not JSON';
        }
      },
      favorite: boolean,
      fileName: text,
    },
  },
  observations: {
    fields: [
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
    required: [
      'observationID',
      'deploymentID',
      'eventStart',
      'eventEnd',
      'observationLevel',
      'observationType',
    ],
    primaryKey: 'observationID',
    checks: {
      eventStart: datetime,
      eventEnd: datetime,
      observationLevel: oneOf(['media', 'event']),
      observationType: oneOf(['animal', 'human', 'vehicle', 'blank', 'unknown', 'unclassified']),
      cameraSetupType: oneOf(['setup', 'calibration']),
      count: integerAtLeast(1),
      // lifeStage and sex enums (from memory: adult/subadult/juvenile; female/male/unknown).
      lifeStage: oneOf(['adult', 'subadult', 'juvenile']),
      sex: oneOf(['female', 'male', 'unknown']),
      bboxX: numberIn(0, 1),
      bboxY: numberIn(0, 1),
      bboxWidth: numberIn(1e-15, 1),
      bboxHeight: numberIn(1e-15, 1),
      classificationMethod: oneOf(['human', 'machine']),
      classificationTimestamp: datetime,
      classificationProbability: numberIn(0, 1),
    },
  },
};

/** Parses a CSV table of a package. */
export function parseTable(text: string): { header: string[]; rows: Rows } {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
  });
  if (parsed.errors.length) throw new Error(`CSV: ${parsed.errors[0]!.message}`);
  return { header: parsed.meta.fields ?? [], rows: parsed.data };
}

/** Every problem of one table against the 1.0.2 schema: header, required values, types, enums, keys. */
export function tableProblems(name: keyof typeof CAMTRAP_1_0_2, text: string): string[] {
  const spec = CAMTRAP_1_0_2[name];
  const { header, rows } = parseTable(text);
  const problems: string[] = [];
  const unknown = header.filter((h) => !spec.fields.includes(h));
  if (unknown.length) problems.push(`${name}: fields not in the standard: ${unknown.join(', ')}`);
  for (const r of spec.required)
    if (!header.includes(r)) problems.push(`${name}: required field ${r} missing`);
  const seen = new Set<string>();
  rows.forEach((row, i) => {
    for (const r of spec.required)
      if (isMissing(row[r])) problems.push(`${name} row ${i + 2}: ${r} is empty`);
    for (const [field, check] of Object.entries(spec.checks)) {
      const v = row[field];
      if (isMissing(v)) continue;
      const problem = check(v!);
      if (problem) problems.push(`${name} row ${i + 2}: ${field} "${v}" ${problem}`);
    }
    const key = row[spec.primaryKey]!;
    if (seen.has(key)) problems.push(`${name} row ${i + 2}: duplicate ${spec.primaryKey} ${key}`);
    seen.add(key);
  });
  return problems;
}

/** Problems of datapackage.json against the 1.0.2 profile's required properties and enums. */
export function packageProblems(pkg: Record<string, unknown>): string[] {
  const problems: string[] = [];
  const p = pkg as {
    profile?: string;
    created?: string;
    contributors?: { title?: string; role?: string }[];
    project?: {
      title?: string;
      samplingDesign?: string;
      captureMethod?: string[];
      individualAnimals?: unknown;
      observationLevel?: string[];
    };
    spatial?: { type?: string; coordinates?: unknown };
    temporal?: { start?: string; end?: string };
    taxonomic?: { scientificName?: string }[];
    resources?: { name?: string; path?: string; profile?: string; schema?: unknown }[];
    licenses?: { scope?: string }[];
    coordinatePrecision?: unknown;
  };
  if (!/camtrap-dp\/1\.0\.2\/camtrap-dp-profile\.json$/.test(p.profile ?? ''))
    problems.push('profile is not the 1.0.2 profile URL');
  if (!p.created || Number.isNaN(Date.parse(p.created)))
    problems.push('created is missing or not a datetime');
  if (!p.contributors?.length) problems.push('contributors missing');
  for (const c of p.contributors ?? []) {
    if (!c.title) problems.push('a contributor has no title');
    if (
      c.role &&
      !['contact', 'principalInvestigator', 'rightsHolder', 'publisher', 'contributor'].includes(
        c.role,
      )
    )
      problems.push(`contributor role ${c.role} not allowed`);
  }
  const project = p.project;
  if (!project?.title) problems.push('project.title missing');
  if (
    ![
      'simpleRandom',
      'systematicRandom',
      'clusteredRandom',
      'experimental',
      'targeted',
      'opportunistic',
    ].includes(project?.samplingDesign ?? '')
  )
    problems.push('project.samplingDesign not in the enum');
  if (
    !project?.captureMethod?.length ||
    !project.captureMethod.every((m) => ['activityDetection', 'timeLapse'].includes(m))
  )
    problems.push('project.captureMethod invalid');
  if (typeof project?.individualAnimals !== 'boolean')
    problems.push('project.individualAnimals is not a boolean');
  if (
    !project?.observationLevel?.length ||
    !project.observationLevel.every((m) => ['media', 'event'].includes(m))
  )
    problems.push('project.observationLevel invalid');
  if (!p.spatial || !['Polygon', 'MultiPolygon', 'Point'].includes(p.spatial.type ?? ''))
    problems.push('spatial is not GeoJSON');
  if (
    !/^\d{4}-\d{2}-\d{2}$/.test(p.temporal?.start ?? '') ||
    !/^\d{4}-\d{2}-\d{2}$/.test(p.temporal?.end ?? '')
  )
    problems.push('temporal start/end are not dates');
  if (!p.taxonomic?.length || !p.taxonomic.every((t) => t.scientificName))
    problems.push('taxonomic missing or without scientificName');
  if ((p.resources ?? []).length < 3) problems.push('fewer than 3 resources');
  for (const name of ['deployments', 'media', 'observations']) {
    const r = p.resources?.find((x) => x.name === name);
    if (!r) problems.push(`resource ${name} missing`);
    else {
      if (r.profile !== 'tabular-data-resource') problems.push(`resource ${name} profile`);
      if (
        r.schema !==
        `https://raw.githubusercontent.com/tdwg/camtrap-dp/1.0.2/${name}-table-schema.json`
      )
        problems.push(`resource ${name} schema URL`);
      if (!r.path || filePathProblem(r.path)) problems.push(`resource ${name} path`);
    }
  }
  if (
    p.licenses &&
    !(p.licenses.some((l) => l.scope === 'data') && p.licenses.some((l) => l.scope === 'media'))
  )
    problems.push('licenses need one data and one media scope');
  if (p.coordinatePrecision !== undefined && typeof p.coordinatePrecision !== 'number')
    problems.push('coordinatePrecision is not a number');
  return problems;
}
