import { route, type RouteSpec } from '../../lib/http';

export function healthRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/health',
      access: 'public',
      summary: 'Liveness and database reachability',
      handle: async ({ deps, res }) => {
        try {
          await deps.sequelize.query('SELECT 1');
          return { status: 'ok', db: 'ok' };
        } catch {
          res.status(503).json({ status: 'degraded', db: 'down' });
          return undefined;
        }
      },
    }),
  ];
}
