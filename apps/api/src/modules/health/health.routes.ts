import { z } from 'zod';
import { ServiceUnavailable } from '../../lib/errors';
import { defineRoute } from '../../routing/route';

export const HealthDto = z.object({ status: z.literal('ok'), database: z.literal('ok') });

const databaseTimeoutMs = 2000;

export const healthRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/health',
    permission: 'public',
    summary: 'Liveness and database check',
    response: HealthDto,
    handler: async ({ ctx }) => {
      let timer: NodeJS.Timeout | undefined;
      const timeout = new Promise<never>((_resolve, reject) => {
        timer = setTimeout(() => reject(new Error('database did not answer in time')), databaseTimeoutMs);
      });
      try {
        await Promise.race([ctx.db.raw('select 1'), timeout]);
      } catch {
        throw new ServiceUnavailable('database_unavailable', 'The database does not answer.');
      } finally {
        clearTimeout(timer);
      }
      return { status: 'ok' as const, database: 'ok' as const };
    },
  }),
];
