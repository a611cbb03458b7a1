import { route, idParams, type RouteSpec } from '../../lib/http';
import { noticeListQuery } from '../../../shared/schemas/facility';
import { listNotices, markAllNoticesRead, markNoticeRead } from './notices.service';

export function noticesRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/notices',
      access: 'member',
      summary: 'My in-app notices, newest first, with the unread count',
      query: noticeListQuery,
      handle: ({ user, query }) => listNotices(user!.id, query),
    }),
    route({
      method: 'post',
      path: '/notices/:id/read',
      access: 'member',
      summary: 'Mark one of my notices read',
      params: idParams,
      handle: ({ deps, user, params }) => markNoticeRead(deps, user!.id, params.id),
    }),
    route({
      method: 'post',
      path: '/notices/read-all',
      access: 'member',
      summary: 'Mark all my notices read',
      handle: ({ deps, user }) => markAllNoticesRead(deps, user!.id),
    }),
  ];
}
