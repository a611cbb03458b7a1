import { z } from 'zod';
import { route, type RouteSpec } from '../../lib/http';
import { AppError } from '../../lib/errors';
import type { MailCatcher } from '../../lib/mail-catcher';

const listQuery = z.strictObject({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

/** Admins read what the local catcher caught, while the demo runs one (never in production). */
export function mailRoutes(catcher: MailCatcher | null): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/mail',
      access: 'admin',
      summary: 'Mail caught by the local SMTP catcher (demo only)',
      query: listQuery,
      handle: ({ query }) => {
        if (!catcher) throw new AppError(404, 'mail_catcher_off', 'No local mail catcher runs here; mail goes to the real SMTP relay.');
        const newestFirst = [...catcher.messages].reverse();
        return { items: newestFirst.slice(query.offset, query.offset + query.limit), total: newestFirst.length };
      },
    }),
  ];
}
