import { createApp } from './app';
import { loadEnv } from './config/env';
import { createDb } from './lib/db';
import { createSessionStore } from './lib/session';
import { scheduleJobs } from './jobs/schedule';

const env = loadEnv();
const db = createDb(env);
const sessionStore = createSessionStore(env);
const app = createApp({ env, db, sessionStore });

const server = app.listen(env.PORT, env.HOST, () => {
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : env.PORT;
  console.log(`FlueLedger API listening on http://${env.HOST}:${port}`);
});

const jobs = env.JOBS_ENABLED ? scheduleJobs(db, (message) => console.log(message)) : [];

let stopping = false;

async function shutdown(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`${signal} received: closing`);
  for (const job of jobs) await job.stop();
  // Stop accepting connections, let requests in flight finish, then close idle keep-alives.
  const closed = new Promise<void>((resolve) => server.close(() => resolve()));
  server.closeIdleConnections();
  const forceTimer = setTimeout(() => server.closeAllConnections(), 10_000);
  forceTimer.unref();
  await closed;
  await Promise.allSettled([db.destroy(), Promise.resolve(sessionStore.close())]);
  process.exit(0);
}

process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
