import { contract } from '../../shared/api';
import { bind, type AnyRoute } from '../http/route';
import { createUser, listUsers, updateUser } from '../services/users';

export const userRoutes: AnyRoute[] = [
  bind(contract.users.list, {
    handler: async ({ user }) => ({ users: await listUsers(user) }),
  }),
  bind(contract.users.create, {
    handler: ({ ctx, user, body }) => createUser(ctx, user, body),
  }),
  bind(contract.users.update, {
    handler: ({ ctx, user, body, params }) => updateUser(ctx, user, params.userId, body),
  }),
];
