import type { Knex } from 'knex';
import cron, { type ScheduledTask } from 'node-cron';
import { purgeStaleWork } from './purge-stale-work';

/**
 * Starts the scheduled jobs of this instance. Every job is safe when several instances run it
 * (each takes a PostgreSQL advisory lock), so every instance may schedule them all.
 */
export function scheduleJobs(db: Knex, log: (message: string) => void): ScheduledTask[] {
  return [
    // Hourly, at a minute past, so a fresh start does not race a migration at the full hour.
    cron.schedule('1 * * * *', async () => {
      try {
        const outcome = await purgeStaleWork(db);
        if (outcome.ran && (outcome.stagingRowsDeleted || outcome.rateLimitsDeleted)) {
          log(`purge-stale-work: ${outcome.stagingRowsDeleted} staging rows, ${outcome.rateLimitsDeleted} rate-limit windows`);
        }
      } catch (error) {
        log(`purge-stale-work failed: ${String(error)}`);
      }
    }),
  ];
}
