import { rm } from 'node:fs/promises';
import { Router, type NextFunction, type Request, type Response } from 'express';
import multer from 'multer';
import {
  camtrapExportQuerySchema,
  dwcExportQuerySchema,
  sheetParamsSchema,
  sheetQuerySchema,
  type ExportPreview,
  type ImportResponse,
  type SheetName,
} from '../../shared/exports';
import { SENSITIVE_FEATURES, type FeatureType } from '../../shared/stations';
import type { AppDeps } from '../app';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { adminOnly, projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { recordAudit } from '../services/audit.service';
import { streamBackup } from '../services/exports/backup';
import { importCamtrapPackage } from '../services/exports/camtrap-import';
import { streamCamtrapZip } from '../services/exports/camtrap-zip';
import { generalizationText } from '../services/exports/coordinates';
import { darwinCoreCsv } from '../services/exports/darwin-core';
import { buildExportModel, type ExportModel } from '../services/exports/export-model';
import {
  catalogueSheet,
  effortSheet,
  historiesSheet,
  sightingsSheet,
} from '../services/exports/sheets.service';
import { roleAtLeast } from '../../shared/roles';
import { sheetCsv, workbook, type Sheet } from '../services/exports/spreadsheets';
import { readZip } from '../services/exports/zip-reader';
import { precisionFor } from '../services/stations.service';

/** Only ecologists may take the exact positions and the photos of people out of Maculo. */
function checkProfile(req: Request, profile: 'public' | 'private', includeSensitive: boolean) {
  // Admins reach a project's exports without a role in it: the public profile only.
  if ((profile === 'private' || includeSensitive) && projectOf(req).viaAdmin) {
    throw new ApiError(
      'forbidden',
      'Only the project’s ecologists may export exact locations, sensitive sites or photos of people.',
    );
  }
}

async function organismNames(deps: AppDeps, project: ProjectsTable): Promise<Map<string, string>> {
  const rows = await deps.db
    .selectFrom('individuals')
    .select(['code', 'nickname'])
    .where('project_id', '=', project.id)
    .where('status', '=', 'active')
    .execute();
  return new Map(rows.filter((r) => r.code && r.nickname).map((r) => [r.code!, r.nickname!]));
}

function preview(model: ExportModel, sensitive: ExportPreview['sensitiveSites']): ExportPreview {
  return {
    profile: model.profile,
    sensitivity: model.project.sensitivity,
    precision: model.policy.precision,
    withheld: model.policy.withheld,
    dataGeneralizations: generalizationText(model.policy),
    deployments: model.deployments.length,
    media: model.media.length,
    observations: model.observations.length,
    identifiedObservations: model.observations.filter((o) => o['individualID']).length,
    sensitiveSites: sensitive,
    leftOut: {
      sensitiveSites: model.report.withheldDeployments.length,
      privateMedia: model.report.privateMedia,
      peopleAndVehicleObservations: model.report.excludedObservations,
      mediaWithoutTime: model.report.skippedMedia,
    },
  };
}

function sendSheets(
  res: Response,
  slug: string,
  name: string,
  format: 'csv' | 'xlsx',
  sheet: Sheet,
) {
  const file = `${slug}-${name}.${format}`;
  res.set('Content-Disposition', `attachment; filename="${file}"`);
  if (format === 'csv') {
    // A byte-order mark so spreadsheet programs read the file as UTF-8.
    res.type('text/csv; charset=utf-8').send(`\uFEFF${sheetCsv(sheet)}\n`);
    return Promise.resolve();
  }
  return workbook([sheet]).then((buffer) => {
    res.type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet').send(buffer);
  });
}

/**
 * Sharing: Camtrap DP and Darwin Core exports (generalised unless an ecologist asks for the
 * private backup), spreadsheets, Camtrap DP import into a new project, and the admin's backup.
 */
export function exportsRoutes(deps: AppDeps): Router {
  const { db, ingest } = deps;
  const router = Router();
  const analysesOnly = (req: Request) => {
    if (!roleAtLeast(projectOf(req).role, 'ecologist')) {
      throw new ApiError(
        'forbidden',
        'Capture histories and effort grids are for the project’s ecologists.',
      );
    }
  };
  const sheetBuilders: Record<SheetName, (req: Request, analysisId?: string) => Promise<Sheet>> = {
    histories: (req, analysisId) => {
      analysesOnly(req);
      return historiesSheet(db, projectOf(req).row, analysisId);
    },
    effort: (req, analysisId) => {
      analysesOnly(req);
      return effortSheet(db, projectOf(req).row, analysisId);
    },
    catalogue: (req) => catalogueSheet(db, projectOf(req).row),
    sightings: (req) => {
      const { row, role, viaAdmin } = projectOf(req);
      return sightingsSheet(db, row, precisionFor(row, role, viaAdmin));
    },
  };

  router.get(
    '/projects/:slug/exports/preview',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const query = parseWith(dwcExportQuerySchema, req.query, 'query');
      checkProfile(req, query.profile, query.includeSensitiveSites);
      const { row } = projectOf(req);
      const model = await buildExportModel(db, row, query.profile, query.includeSensitiveSites);
      const stations = new Map(
        (
          await db
            .selectFrom('stations')
            .select(['id', 'code'])
            .where('project_id', '=', row.id)
            .execute()
        ).map((s) => [s.id, s.code]),
      );
      const sensitive = (
        await db
          .selectFrom('deployments')
          .select(['id', 'station_id', 'feature_type'])
          .where('project_id', '=', row.id)
          .where('feature_type', 'in', [...SENSITIVE_FEATURES])
          .execute()
      ).map((d) => ({
        deploymentId: d.id,
        station: stations.get(d.station_id) ?? '',
        featureType: d.feature_type as FeatureType,
      }));
      res.json(preview(model, sensitive));
    },
  );

  // Every export that leaves Maculo is in the audit log: who, which profile, which options.
  const auditedModel = async (
    req: Request,
    action: string,
    query: { profile: 'public' | 'private'; includeSensitiveSites: boolean },
  ) => {
    checkProfile(req, query.profile, query.includeSensitiveSites);
    const { row } = projectOf(req);
    const model = await buildExportModel(db, row, query.profile, query.includeSensitiveSites);
    await recordAudit(db, {
      userId: userOf(req).id,
      projectId: row.id,
      action,
      entity: 'project',
      entityId: row.id,
      after: query,
    });
    return model;
  };

  router.get(
    '/projects/:slug/exports/camtrap-dp',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const query = parseWith(camtrapExportQuerySchema, req.query, 'query');
      const model = await auditedModel(req, 'export-camtrap-dp', query);
      await streamCamtrapZip(db, ingest.storage, model, res, query.media === 'files');
    },
  );

  router.get(
    '/projects/:slug/exports/dwc',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const query = parseWith(dwcExportQuerySchema, req.query, 'query');
      const model = await auditedModel(req, 'export-dwc', query);
      const { row } = projectOf(req);
      res.set(
        'Content-Disposition',
        `attachment; filename="${row.slug}-occurrences-${query.profile}.csv"`,
      );
      res
        .type('text/csv; charset=utf-8')
        .send(`${darwinCoreCsv(model, await organismNames(deps, row))}\n`);
    },
  );

  router.get(
    '/projects/:slug/exports/sheets/:sheet.:format',
    projectRole(db, 'reviewer', { allowAdmin: true }),
    async (req, res) => {
      const params = parseWith(sheetParamsSchema, req.params, 'params');
      const query = parseWith(sheetQuerySchema, req.query, 'query');
      const build = sheetBuilders[params.sheet];
      await sendSheets(
        res,
        projectOf(req).row.slug,
        params.sheet,
        params.format,
        await build(req, query.analysisId),
      );
    },
  );

  // Import: one zip in the field "package", kept in the temp area only while it is read.
  const upload = multer({
    dest: ingest.storage.tmpDir,
    limits: { files: 1, fileSize: ingest.limits.maxRequestBytes, fields: 5, parts: 10 },
  }).single('package');
  const receive = (req: Request, res: Response, next: NextFunction) => {
    if (!req.is('multipart/form-data')) {
      throw new ApiError(
        'bad_request',
        'Send the package as multipart/form-data in the field "package".',
      );
    }
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_UNEXPECTED_FILE') {
        return next(
          new ApiError(
            'bad_request',
            `Send the package in the form field "package" (got "${err.field ?? ''}").`,
          ),
        );
      }
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(
          new ApiError('payload_too_large', 'The package is larger than the server accepts.'),
        );
      }
      next(
        new ApiError(
          'bad_request',
          `The upload could not be read (${err instanceof Error ? err.message : String(err)}).`,
        ),
      );
    });
  };

  router.post('/projects/import/camtrap-dp', adminOnly(), receive, async (req, res) => {
    const file = req.file;
    if (!file)
      throw new ApiError('bad_request', 'Attach a Camtrap DP zip in the form field "package".');
    try {
      const files = await readZip(file.path, ingest.limits.maxRequestBytes * 4);
      const { slug, report } = await importCamtrapPackage(
        db,
        ingest.storage,
        files,
        userOf(req),
        ingest.maxMegapixels,
      );
      ingest.runner.kick();
      const body: ImportResponse = { project: { slug }, report };
      res.status(201).json(body);
    } finally {
      await rm(file.path, { force: true });
    }
  });

  router.get('/admin/backup', adminOnly(), async (req, res) => {
    await recordAudit(db, {
      userId: userOf(req).id,
      projectId: null,
      action: 'download-backup',
      entity: 'instance',
      entityId: null,
    });
    await streamBackup(db, deps.sqlite, ingest.storage, res);
  });

  return router;
}
