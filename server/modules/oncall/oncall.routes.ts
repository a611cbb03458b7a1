import { z } from 'zod';
import { route, idParams, type RouteSpec } from '../../lib/http';
import { AppError } from '../../lib/errors';
import type { SmsFake } from '../../lib/sms-fake';
import type { SmsMode } from '../../lib/sms';
import {
  contactInput,
  coverInput,
  fakeReplyInput,
  inboundSmsEvent,
  pageAckInput,
  policyInput,
  rotaQuery,
  severityParams,
  shiftInput,
  userParams,
} from '../../../shared/schemas/oncall';
import { createCover, createShift, deleteCover, deleteShift, removeContact, rotaView, savePolicy, setContact } from './rota.service';
import { acknowledgeByLink, acknowledgeInApp, receiveText, ticketPages } from './escalation.service';
import { SMS_WEBHOOK_PATH } from './sms-webhook';

/** The provider's inbound webhook: mounted before sessions and CSRF (app.ts), signed or refused. */
export function smsWebhookRoutes(): RouteSpec[] {
  return [
    route({
      method: 'post',
      path: SMS_WEBHOOK_PATH,
      access: 'webhook',
      summary: 'Inbound texts from the SMS provider (a reply acknowledges a page)',
      body: inboundSmsEvent,
      handle: async ({ body, deps }) => {
        const p = body.data.payload;
        const result = await receiveText(deps, {
          id: body.data.id,
          type: body.data.event_type,
          from: p?.from.phone_number ?? '',
          text: p?.text ?? '',
        });
        return { received: true, acknowledged: result.handled };
      },
    }),
  ];
}

export function oncallRoutes(opts: { smsFake: SmsFake | null; smsMode: () => SmsMode }): RouteSpec[] {
  const fake = () => {
    if (!opts.smsFake) throw new AppError(404, 'sms_fake_off', 'No local SMS fake runs here; texts go to the provider.');
    return opts.smsFake;
  };
  return [
    route({
      method: 'get',
      path: '/oncall/rota',
      access: 'admin',
      summary: 'The on-call rota, covers, escalation policies and pager numbers',
      query: rotaQuery,
      handle: ({ query, deps }) =>
        rotaView(deps, { from: query.from ? new Date(query.from) : new Date(), days: query.days, smsMode: opts.smsMode() }),
    }),
    route({
      method: 'post',
      path: '/oncall/shifts',
      access: 'admin',
      status: 201,
      body: shiftInput,
      handle: ({ body }) => createShift(body),
    }),
    route({
      method: 'delete',
      path: '/oncall/shifts/:id',
      access: 'admin',
      params: idParams,
      handle: ({ params }) => deleteShift(params.id),
    }),
    route({
      method: 'post',
      path: '/oncall/covers',
      access: 'admin',
      status: 201,
      body: coverInput,
      handle: ({ body }) => createCover(body),
    }),
    route({
      method: 'delete',
      path: '/oncall/covers/:id',
      access: 'admin',
      params: idParams,
      handle: ({ params }) => deleteCover(params.id),
    }),
    route({
      method: 'put',
      path: '/oncall/policies/:severity',
      access: 'admin',
      params: severityParams,
      body: policyInput,
      handle: ({ params, body, deps }) => savePolicy(deps, params.severity, body),
    }),
    route({
      method: 'put',
      path: '/oncall/contacts/:userId',
      access: 'admin',
      params: userParams,
      body: contactInput,
      handle: ({ params, body }) => setContact(params.userId, body.phone),
    }),
    route({
      method: 'delete',
      path: '/oncall/contacts/:userId',
      access: 'admin',
      params: userParams,
      handle: ({ params }) => removeContact(params.userId),
    }),
    route({
      method: 'post',
      path: '/oncall/pages/acknowledge',
      // The page's link is the credential (like account links): the person may be signed out on their phone.
      access: 'public',
      summary: 'Acknowledge a page with the single-use link from its text or mail',
      body: pageAckInput,
      handle: ({ body, deps }) => acknowledgeByLink(deps, body.token),
    }),
    route({
      method: 'get',
      path: '/tickets/:id/pages',
      access: 'technician',
      summary: 'Who was paged for the ticket, when, and who acknowledged',
      params: idParams,
      handle: ({ params, user }) => ticketPages(user!, params.id),
    }),
    route({
      method: 'post',
      path: '/tickets/:id/pages/acknowledge',
      access: 'technician',
      params: idParams,
      handle: ({ params, user, deps }) => acknowledgeInApp(deps, user!, params.id),
    }),
    route({
      method: 'get',
      path: '/sms/caught',
      access: 'admin',
      summary: 'Texts the local SMS fake received (demo only)',
      handle: () => ({ items: [...fake().texts].reverse().slice(0, 200) }),
    }),
    route({
      method: 'post',
      path: '/sms/caught/:textId/reply',
      access: 'admin',
      summary: 'Text back from the fake, signed as the provider signs, to the inbound webhook',
      params: z.strictObject({ textId: z.uuid() }),
      body: fakeReplyInput,
      handle: async ({ params, body }) => {
        const f = fake();
        if (!f.texts.some((t) => t.id === params.textId)) throw new AppError(404, 'not_found', 'That text was not found.');
        return { status: await f.reply(params.textId, body.text) };
      },
    }),
  ];
}
