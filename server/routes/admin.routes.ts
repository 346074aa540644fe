import { Router } from 'express';
import { createUserBodySchema, updateUserBodySchema, type OutboxMessage } from '../../shared/admin';
import { idSchema, pageQuerySchema } from '../../shared/ids';
import { createProjectBodySchema } from '../../shared/projects';
import type { AppDeps } from '../app';
import type { MailMessagesTable } from '../db/schema/audit.table';
import { ApiError } from '../errors/api-error';
import { adminOnly, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { decodeCursor, encodeCursor } from '../services/cursor';
import { sendAccountCreated } from '../services/password-resets.service';
import { createProject, toProjectDetail } from '../services/projects.service';
import { createUser, listUsers, updateUser } from '../services/users.service';

function toOutbox(row: MailMessagesTable): OutboxMessage {
  return {
    id: row.id,
    to: row.to_addr,
    from: row.from_addr,
    subject: row.subject,
    text: row.text,
    html: row.html,
    receivedAt: row.received_at,
  };
}

/** Admin pages: users, projects and the local mail outbox. */
export function adminRoutes({ db, config, mailer }: AppDeps): Router {
  const router = Router();

  router.get('/admin/users', adminOnly(), async (_req, res) => {
    res.json(await listUsers(db));
  });

  router.post('/admin/users', adminOnly(), async (req, res) => {
    const body = parseWith(createUserBodySchema, req.body);
    const row = await createUser(db, body, userOf(req).id);
    if (!body.password) await sendAccountCreated(db, mailer, row, config.publicUrl);
    const created = (await listUsers(db)).find((u) => u.id === row.id);
    res.status(201).json(created);
  });

  router.patch('/admin/users/:id', adminOnly(), async (req, res) => {
    const id = parseWith(idSchema, req.params['id'], 'id');
    const body = parseWith(updateUserBodySchema, req.body);
    await updateUser(db, id, body, userOf(req).id);
    const updated = (await listUsers(db)).find((u) => u.id === id);
    res.json(updated);
  });

  router.get('/admin/projects', adminOnly(), async (_req, res) => {
    const rows = await db.selectFrom('projects').selectAll().orderBy('name').execute();
    const counts = await db
      .selectFrom('memberships')
      .select(['project_id', db.fn.countAll<number>().as('members')])
      .groupBy('project_id')
      .execute();
    res.json(
      rows.map((row) => ({
        ...toProjectDetail(row, null),
        members: Number(counts.find((c) => c.project_id === row.id)?.members ?? 0),
      })),
    );
  });

  router.post('/admin/projects', adminOnly(), async (req, res) => {
    const body = parseWith(createProjectBodySchema, req.body);
    const row = await createProject(db, body, userOf(req).id);
    res.status(201).json(toProjectDetail(row, null));
  });

  router.get('/admin/outbox', adminOnly(), async (req, res) => {
    const page = parseWith(pageQuerySchema, req.query, 'query');
    let query = db.selectFrom('mail_messages').selectAll();
    if (page.after) {
      const [at, id] = decodeCursor(page.after, 2) as [string, string];
      query = query.where((eb) =>
        eb.or([
          eb('received_at', '<', at),
          eb.and([eb('received_at', '=', at), eb('id', '<', id)]),
        ]),
      );
    }
    const rows = await query
      .orderBy('received_at', 'desc')
      .orderBy('id', 'desc')
      .limit(page.limit + 1)
      .execute();
    const items = rows.slice(0, page.limit).map(toOutbox);
    const last = rows.length > page.limit ? rows[page.limit - 1] : undefined;
    res.json({ items, next: last ? encodeCursor([last.received_at, last.id]) : null });
  });

  router.get('/admin/outbox/:id', adminOnly(), async (req, res) => {
    const id = parseWith(idSchema, req.params['id'], 'id');
    const row = await db
      .selectFrom('mail_messages')
      .selectAll()
      .where('id', '=', id)
      .executeTakeFirst();
    if (!row) throw new ApiError('not_found', 'This message was not found.');
    res.json(toOutbox(row));
  });

  return router;
}
