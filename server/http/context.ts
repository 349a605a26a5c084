// The context and the signed-in user are the services' own (server/services/context.ts); the HTTP layer uses them.
export type { AppContext, AuthUser } from '../services/context';
