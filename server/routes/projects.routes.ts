import { Router } from 'express';
import { idSchema } from '../../shared/ids';
import {
  inviteBodySchema,
  setMemberBodySchema,
  updateProjectBodySchema,
} from '../../shared/projects';
import { roleAtLeast } from '../../shared/roles';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, signedIn, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { regroupProject } from '../services/events.service';
import { inviteToProject, listInvitations } from '../services/invitations.service';
import { listMembers, removeMember, setMemberRole } from '../services/members.service';
import { listProjectsFor, toProjectDetail, updateProject } from '../services/projects.service';

/** Projects, their settings, members and invitations. */
export function projectsRoutes({ db, config, mailer }: AppDeps): Router {
  const router = Router();

  router.get('/projects', signedIn(), async (req, res) => {
    res.json(await listProjectsFor(db, userOf(req)));
  });

  router.get('/projects/:slug', projectRole(db, 'volunteer', { allowAdmin: true }), (req, res) => {
    const { row, role } = projectOf(req);
    res.json(toProjectDetail(row, role));
  });

  router.patch(
    '/projects/:slug',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const body = parseWith(updateProjectBodySchema, req.body);
      const { row, role } = projectOf(req);
      const updated = await updateProject(db, row, body, userOf(req).id);
      if (updated.independence_minutes !== row.independence_minutes) {
        await regroupProject(db, updated.id, updated.independence_minutes);
      }
      res.json(toProjectDetail(updated, role));
    },
  );

  router.get(
    '/projects/:slug/members',
    projectRole(db, 'volunteer', { allowAdmin: true }),
    async (req, res) => {
      const { row, role, viaAdmin } = projectOf(req);
      res.json(
        await listMembers(
          db,
          row.id,
          viaAdmin || roleAtLeast(role, 'ecologist') || userOf(req).isAdmin,
        ),
      );
    },
  );

  router.put(
    '/projects/:slug/members/:userId',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const userId = parseWith(idSchema, req.params['userId'], 'userId');
      const body = parseWith(setMemberBodySchema, req.body);
      const actor = userOf(req);
      if (userId === actor.id && !actor.isAdmin) {
        throw new ApiError(
          'conflict',
          'You cannot change your own role; ask another ecologist or an admin.',
        );
      }
      await setMemberRole(db, projectOf(req).row.id, userId, body.role, actor.id);
      res.json(await listMembers(db, projectOf(req).row.id, true));
    },
  );

  router.delete(
    '/projects/:slug/members/:userId',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const userId = parseWith(idSchema, req.params['userId'], 'userId');
      const actor = userOf(req);
      if (userId === actor.id && !actor.isAdmin) {
        throw new ApiError(
          'conflict',
          'You cannot remove yourself; ask another ecologist or an admin.',
        );
      }
      await removeMember(db, projectOf(req).row.id, userId, actor.id);
      res.status(204).end();
    },
  );

  router.get(
    '/projects/:slug/invitations',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      res.json(await listInvitations(db, projectOf(req).row.id));
    },
  );

  router.post(
    '/projects/:slug/invitations',
    projectRole(db, 'ecologist', { allowAdmin: true }),
    async (req, res) => {
      const body = parseWith(inviteBodySchema, req.body);
      const { row, role } = projectOf(req);
      const invitation = await inviteToProject(db, mailer, {
        project: row,
        email: body.email,
        role: body.role,
        inviter: userOf(req),
        inviterRole: role,
        publicUrl: config.publicUrl,
      });
      res.status(201).json(invitation);
    },
  );

  return router;
}
