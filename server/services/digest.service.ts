import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import type { Mailer } from '../mail/mailer';
import { curateDigestMail } from '../mail/templates';
import { suggestDuplicates } from './duplicates.service';
import { zoneOffsetMs } from './camera-time';

/** Sends the curators of a project a digest of pending disputes and suggested duplicates. */
export async function sendCurateDigest(
  db: Db,
  mailer: Mailer,
  project: ProjectsTable,
  publicUrl: string,
): Promise<{ recipients: number; disputes: number; suggestions: number }> {
  const disputes = await db
    .selectFrom('sightings')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('project_id', '=', project.id)
    .where('state', '=', 'disputed')
    .executeTakeFirstOrThrow();
  const suggestions = await suggestDuplicates(db, project.id);
  const curators = await db
    .selectFrom('memberships')
    .innerJoin('users', 'users.id', 'memberships.user_id')
    .select(['users.email', 'users.name'])
    .where('memberships.project_id', '=', project.id)
    .where('memberships.role', 'in', ['curator', 'ecologist'])
    .where('users.disabled', '=', 0)
    .execute();
  for (const c of curators) {
    await mailer.send(
      curateDigestMail({
        to: c.email,
        name: c.name,
        projectName: project.name,
        disputes: Number(disputes.n),
        suggestions: suggestions.length,
        examples: suggestions
          .slice(0, 5)
          .map((s) => `${s.first.code} and ${s.second.code}: ${s.evidence[0]!.text}`),
        link: `${publicUrl}/p/${project.slug}/curate`,
      }),
    );
  }
  await db
    .updateTable('projects')
    .set({ last_digest_at: new Date().toISOString() })
    .where('id', '=', project.id)
    .execute();
  return {
    recipients: curators.length,
    disputes: Number(disputes.n),
    suggestions: suggestions.length,
  };
}

/** Local date (YYYY-MM-DD) and hour of an instant in a zone. */
function localDayHour(ms: number, zone: string): { day: string; hour: number } {
  const local = new Date(ms + zoneOffsetMs(zone, ms));
  return { day: local.toISOString().slice(0, 10), hour: local.getUTCHours() };
}

/**
 * The daily digest: once a day, from 06:00 in each project's own time zone, to projects with
 * something pending. Safe to call often (it remembers when it last sent, across restarts).
 */
export async function sendDueDigests(
  db: Db,
  mailer: Mailer,
  publicUrl: string,
  now = Date.now(),
): Promise<number> {
  const projects = await db.selectFrom('projects').selectAll().execute();
  let sent = 0;
  for (const project of projects) {
    const today = localDayHour(now, project.timezone);
    if (today.hour < 6) continue;
    if (
      project.last_digest_at &&
      localDayHour(Date.parse(project.last_digest_at), project.timezone).day === today.day
    )
      continue;
    const pending = await db
      .selectFrom('sightings')
      .select('id')
      .where('project_id', '=', project.id)
      .where('state', '=', 'disputed')
      .limit(1)
      .executeTakeFirst();
    const suggestions = pending ? [] : await suggestDuplicates(db, project.id);
    if (!pending && suggestions.length === 0) continue;
    await sendCurateDigest(db, mailer, project, publicUrl);
    sent++;
  }
  return sent;
}
