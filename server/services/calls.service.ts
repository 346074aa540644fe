import type { CallBody, CallResult, Verdict } from '../../shared/identify';
import type { SightingState } from '../../shared/sort';
import type { Db } from '../db/database';
import type { CallsTable } from '../db/schema/identify.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { bumpCatalogue } from './catalogue-cache';
import { newId } from './ids';
import {
  activateIndividual,
  addFirstReference,
  createIndividual,
  referenceFlank,
  resolveIndividual,
} from './individuals.service';

const NO_DESCRIPTION = { nickname: null, sex: 'unknown' as const, notes: '', tags: [] as string[] };

function agree(
  a: { verdict: string; individual_id: string | null },
  b: { verdict: Verdict; individualId: string | null },
): boolean {
  if (a.verdict !== b.verdict) return false;
  return a.verdict !== 'match' || a.individual_id === b.individualId;
}

/**
 * Records a reviewer's call and moves the sighting on. With one reviewer per sighting a call
 * decides it; with two, the first makes it `proposed` (a "new" becomes a provisional individual
 * nobody else sees), and the second, made blind, confirms it when both agree or sends it to the
 * curator as `disputed` when they do not.
 */
export async function makeCall(
  db: Db,
  project: ProjectsTable,
  reviewer: { id: string },
  sightingId: string,
  body: CallBody,
): Promise<CallResult> {
  return db.transaction().execute(async (trx) => {
    const sighting = await trx
      .selectFrom('sightings')
      .selectAll()
      .where('id', '=', sightingId)
      .where('project_id', '=', project.id)
      .executeTakeFirst();
    if (!sighting) throw new ApiError('not_found', 'This sighting was not found.');
    if (sighting.state !== 'open' && sighting.state !== 'proposed') {
      throw new ApiError(
        'conflict',
        `This sighting is already ${sighting.state}; no more calls are taken.`,
      );
    }
    const previous = await trx
      .selectFrom('calls')
      .selectAll()
      .where('sighting_id', '=', sightingId)
      .execute();
    if (previous.some((c) => c.reviewer_id === reviewer.id)) {
      throw new ApiError(
        'conflict',
        'You already made a call on this sighting; a second review must come from someone else.',
      );
    }
    const now = new Date().toISOString();
    if (
      sighting.lease_holder &&
      sighting.lease_holder !== reviewer.id &&
      sighting.lease_until &&
      sighting.lease_until > now
    ) {
      throw new ApiError('conflict', 'Another reviewer is identifying this sighting right now.');
    }
    let individualId: string | null = null;
    if (body.verdict === 'match')
      individualId = (await resolveIndividual(trx, project.id, body.individualId!)).id;
    if (
      body.verdict === 'match' &&
      (
        await trx
          .selectFrom('individuals')
          .select('status')
          .where('id', '=', individualId!)
          .executeTakeFirstOrThrow()
      ).status !== 'active'
    ) {
      throw new ApiError(
        'validation_failed',
        'individualId: this individual is not in the catalogue.',
      );
    }

    const decides = project.reviewers_per_sighting === 1 || previous.length >= 1;
    let state: SightingState;
    let createdId: string | null = null;
    if (body.verdict === 'new') {
      const status =
        decides && (previous.length === 0 || previous[0]!.verdict === 'new')
          ? 'active'
          : 'provisional';
      if (!(decides && previous[0]?.verdict === 'new')) {
        const created = await createIndividual(
          trx,
          project.id,
          body.individual ?? NO_DESCRIPTION,
          status,
          reviewer.id,
        );
        createdId = created.id;
        individualId = created.id;
      }
    }
    let finalIndividual: string | null = null;
    if (!decides) {
      state = 'proposed';
    } else if (previous.length === 0) {
      state = body.verdict === 'unidentifiable' ? 'unidentifiable' : 'confirmed';
      finalIndividual = individualId;
    } else {
      const first = previous[0]!;
      if (first.verdict === 'new' && body.verdict === 'new') {
        // Both saw a new animal: the first reviewer's provisional individual joins the catalogue.
        const activated = await activateIndividual(trx, first.individual_id!, reviewer.id);
        individualId = activated.id;
        finalIndividual = activated.id;
        state = 'confirmed';
      } else if (agree(first, { verdict: body.verdict, individualId })) {
        state = body.verdict === 'unidentifiable' ? 'unidentifiable' : 'confirmed';
        finalIndividual = individualId;
      } else {
        state = 'disputed';
      }
    }
    const call: CallsTable = {
      id: newId(),
      project_id: project.id,
      sighting_id: sightingId,
      reviewer_id: reviewer.id,
      verdict: body.verdict,
      individual_id: individualId,
      note: body.note,
      created_at: now,
    };
    await trx.insertInto('calls').values(call).execute();
    await trx
      .updateTable('sightings')
      .set({
        state,
        individual_id: finalIndividual,
        lease_holder: null,
        lease_until: null,
        updated_at: now,
      })
      .where('id', '=', sightingId)
      .execute();
    if (finalIndividual) {
      await addFirstReference(
        trx,
        finalIndividual,
        referenceFlank(sighting.flank),
        sighting.best_photo_id,
        reviewer.id,
      );
    }
    await recordAudit(trx, {
      userId: reviewer.id,
      projectId: project.id,
      action: 'call',
      entity: 'sighting',
      entityId: sightingId,
      before: { state: sighting.state },
      after: { verdict: body.verdict, individualId, state },
    });
    bumpCatalogue(project.id);
    const individual = individualId
      ? await trx
          .selectFrom('individuals')
          .select(['id', 'code', 'status'])
          .where('id', '=', individualId)
          .executeTakeFirst()
      : undefined;
    return {
      sighting: { id: sightingId, state, individualId: finalIndividual },
      call: {
        id: call.id,
        verdict: body.verdict,
        individualId: createdId && state === 'proposed' ? null : individualId,
      },
      ...(individual
        ? { individual: { id: individual.id, code: individual.code, status: individual.status } }
        : {}),
    };
  });
}
