import { z } from 'zod';
import { endpoint } from './endpoint';

/** Liveness. */
export const systemApi = {
  health: endpoint({
    method: 'get',
    path: '/health',
    summary: 'Liveness and database check.',
    tag: 'system',
    access: 'public',
    response: z.object({ ok: z.boolean(), database: z.string() }),
  }),
};
