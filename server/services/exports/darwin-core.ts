import type { ExportModel, Row } from './export-model';
import { generalizationText } from './coordinates';
import { toCsv } from './camtrap-tables';

/** Darwin Core occurrence fields, in order. */
export const DWC_FIELDS = [
  'occurrenceID',
  'basisOfRecord',
  'occurrenceStatus',
  'eventID',
  'parentEventID',
  'eventDate',
  'samplingProtocol',
  'samplingEffort',
  'organismID',
  'organismName',
  'scientificName',
  'individualCount',
  'sex',
  'lifeStage',
  'locationID',
  'decimalLatitude',
  'decimalLongitude',
  'geodeticDatum',
  'coordinateUncertaintyInMeters',
  'coordinatePrecision',
  'dataGeneralizations',
  'informationWithheld',
  'identificationVerificationStatus',
] as const;

/**
 * Darwin Core occurrences: one row per animal observation of the (already filtered and
 * generalised) export model, that is one per identified animal per event, and one per event of
 * other species.
 */
export function darwinCoreCsv(model: ExportModel, organismNames: Map<string, string>): string {
  const deployments = new Map(model.deployments.map((d) => [String(d['deploymentID']), d]));
  const agreement = new Map(
    model.sightings.map((s) => [String(s['observationID']), String(s['reviewAgreement'])]),
  );
  const generalised = generalizationText(model.policy);
  const rows: Row[] = [];
  for (const o of model.observations) {
    if (o['observationType'] !== 'animal') continue;
    const d = deployments.get(String(o['deploymentID']))!;
    const days =
      (Date.parse(String(d['deploymentEnd'])) - Date.parse(String(d['deploymentStart']))) /
      86_400_000;
    const individual = o['individualID'] ? String(o['individualID']) : null;
    const how = agreement.get(String(o['observationID']));
    rows.push({
      occurrenceID: o['observationID'],
      basisOfRecord: 'MachineObservation',
      occurrenceStatus: 'detected',
      eventID: o['eventID'],
      parentEventID: o['deploymentID'],
      eventDate: `${o['eventStart']}/${o['eventEnd']}`,
      samplingProtocol: 'camera trap',
      samplingEffort: `${Math.round(days * 10) / 10} trap-nights`,
      organismID: individual,
      organismName: individual ? (organismNames.get(individual) ?? null) : null,
      scientificName: o['scientificName'],
      individualCount: o['count'],
      sex: o['sex'],
      lifeStage: o['lifeStage'],
      locationID: d['locationID'],
      decimalLatitude: model.policy.withheld ? null : d['latitude'],
      decimalLongitude: model.policy.withheld ? null : d['longitude'],
      geodeticDatum: 'EPSG:4326',
      coordinateUncertaintyInMeters: model.policy.withheld ? null : d['coordinateUncertainty'],
      coordinatePrecision: model.policy.withheld ? null : model.policy.precision,
      dataGeneralizations: generalised || null,
      informationWithheld: model.policy.withheld
        ? 'coordinates withheld for a species of extreme sensitivity'
        : null,
      identificationVerificationStatus:
        how === 'two-reviewers-agree' || how === 'curator-decided'
          ? 'verified using recorded media'
          : null,
    });
  }
  return toCsv(DWC_FIELDS, rows);
}
