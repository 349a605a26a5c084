import { createUserSchema, updateUserSchema, userAdminSchema, userListSchema } from '../../shared/schemas/users';
import { defineRoute, type AnyRoute } from '../http/route';
import { createUser, listUsers, updateUser } from '../services/users';

export const userRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/users',
    summary: 'Users of the organization.',
    tag: 'team',
    access: ['admin'],
    response: userListSchema,
    handler: async ({ user }) => ({ users: await listUsers(user) }),
  }),
  defineRoute({
    method: 'post',
    path: '/users',
    summary: 'Create a user with a role.',
    tag: 'team',
    access: ['admin'],
    body: createUserSchema,
    response: userAdminSchema,
    status: 201,
    handler: ({ ctx, user, body }) => createUser(ctx, user, body),
  }),
  defineRoute({
    method: 'patch',
    path: '/users/:userId',
    summary: 'Rename, change role, deactivate or reactivate a user (role change and deactivation end their sessions).',
    tag: 'team',
    access: ['admin'],
    body: updateUserSchema,
    response: userAdminSchema,
    handler: ({ ctx, user, body, params }) => updateUser(ctx, user, params.userId, body),
  }),
];
