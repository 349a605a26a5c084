import { createUserSchema, updateUserSchema, userAdminSchema, userListSchema } from '../schemas/users';
import { endpoint } from './endpoint';

/** Users of the organization (the team). */
export const usersApi = {
  list: endpoint({
    method: 'get',
    path: '/users',
    summary: 'Users of the organization.',
    tag: 'team',
    access: ['admin'],
    response: userListSchema,
  }),
  create: endpoint({
    method: 'post',
    path: '/users',
    summary: 'Create a user with a role.',
    tag: 'team',
    access: ['admin'],
    body: createUserSchema,
    response: userAdminSchema,
    status: 201,
  }),
  update: endpoint({
    method: 'patch',
    path: '/users/:userId',
    summary: 'Rename, change role, deactivate or reactivate a user (role change and deactivation end their sessions).',
    tag: 'team',
    access: ['admin'],
    body: updateUserSchema,
    response: userAdminSchema,
  }),
};
