import { route, idParams, type RouteSpec } from '../../lib/http';
import { userListQuery, inviteUserSchema, updateUserSchema } from '../../../shared/schemas/users';
import { listUsers, inviteUser, updateUser } from './users.service';

export function usersRoutes(): RouteSpec[] {
  return [
    route({
      method: 'get',
      path: '/users',
      access: 'admin',
      summary: 'List people',
      query: userListQuery,
      handle: ({ query, user }) => listUsers(user!, query),
    }),
    route({
      method: 'post',
      path: '/users',
      access: 'admin',
      summary: 'Invite a person by e-mail',
      body: inviteUserSchema,
      status: 201,
      handle: ({ deps, body, user }) => inviteUser(deps, body, user!),
    }),
    route({
      method: 'patch',
      path: '/users/:id',
      access: 'admin',
      summary: 'Change role, on-call, or disable',
      params: idParams,
      body: updateUserSchema,
      handle: ({ deps, params, body, user }) => updateUser(deps, params.id, body, user!),
    }),
  ];
}
