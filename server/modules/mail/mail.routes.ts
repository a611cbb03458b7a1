import { z } from 'zod';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { listLateMail, resendMail } from './mail.service';
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
    route({
      method: 'get',
      path: '/mail/late',
      access: 'admin',
      summary: 'Mail queued over an hour ago and still not delivered (retried until it goes out)',
      query: listQuery,
      handle: ({ query }) => listLateMail(query),
    }),
    route({
      method: 'post',
      path: '/mail/:id/resend',
      access: 'admin',
      summary: 'Try a mail that has not gone out again now',
      params: idParams,
      handle: ({ params }) => resendMail(params.id),
    }),
  ];
}
