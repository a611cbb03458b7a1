import { route, type RouteSpec } from '../../lib/http';
import { pushSubscriptionInput, pushUnsubscribeInput } from '../../../shared/schemas/push';
import { pushStatus, subscribe, unsubscribe } from './push.service';

export function pushRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/push',
      access: 'member',
      summary: 'The key a browser needs to subscribe, and how many of my browsers receive pushes',
      handle: ({ deps, user }) => pushStatus(deps, user!.id),
    }),
    route({
      method: 'post',
      path: '/push/subscriptions',
      access: 'member',
      summary: 'Receive "tool is back" and "your report was fixed" as phone notifications in this browser',
      body: pushSubscriptionInput,
      handle: ({ deps, user, body }) => subscribe(deps, user!.id, body),
    }),
    route({
      method: 'post',
      path: '/push/subscriptions/remove',
      access: 'member',
      summary: 'Stop phone notifications in this browser',
      body: pushUnsubscribeInput,
      handle: ({ deps, user, body }) => unsubscribe(deps, user!.id, body.endpoint),
    }),
  ];
}
