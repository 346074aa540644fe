import { Router } from 'express';
import { sql } from 'kysely';
import type { AppDeps } from '../app';
import { publicRoute } from '../middleware/access';

/** Liveness for load balancers and the start script. */
export function healthRoutes({ db }: AppDeps): Router {
  const router = Router();
  router.get('/health', publicRoute(), async (_req, res) => {
    await sql`select 1`.execute(db);
    res.json({ status: 'ok' });
  });
  return router;
}
