/**
 * Starts the real FlueLedger server (built web app + API) once for the browser suites, against
 * the database infra/test.sh prepared (migrated and seeded). The URL reaches the test files
 * through FL_E2E_URL.
 */
import { spawn } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

export default async function globalSetup(): Promise<void> {
  const repo = join(__dirname, '..', '..');
  // WEB_DIST_DIR (read by the server too) lets a run serve its own build instead of dist/web.
  const webDist = process.env.WEB_DIST_DIR ?? 'dist/web/browser';
  if (!existsSync(resolve(repo, webDist, 'index.html'))) {
    throw new Error(`${webDist} is missing: build the web app first (npm test does it).`);
  }
  if (!process.env.DATABASE_URL) throw new Error('DATABASE_URL is not set: run the browser suite through npm test.');
  const port = Number(process.env.FL_E2E_PORT ?? 3107);
  const url = `http://127.0.0.1:${port}`;
  // Another run's server on the same port would answer the health check below, and the tests
  // would silently drive that server (its database, its build): refuse to start instead.
  const taken = await fetch(`${url}/api/health`).then(() => true, () => false);
  if (taken) throw new Error(`port ${port} is already in use: choose another with FL_E2E_PORT`);
  const child = spawn(process.execPath, ['--import', 'tsx', 'apps/api/src/server.ts'], {
    cwd: repo,
    env: { ...process.env, PORT: String(port), HOST: '127.0.0.1', NODE_ENV: 'test', LOG_LEVEL: 'warn' },
    stdio: ['ignore', 'inherit', 'inherit'],
    detached: false,
  });
  // One pid file per port, so runs on different ports never stop each other's server.
  writeFileSync(join(repo, '.tmp', `e2e-server-${port}.pid`), String(child.pid));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('server did not answer /api/health within 60 s');
    await new Promise((r) => setTimeout(r, 250));
  }
  process.env.FL_E2E_URL = url;
}
