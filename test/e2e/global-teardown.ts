import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

export default async function globalTeardown(): Promise<void> {
  const port = Number(process.env.FL_E2E_PORT ?? 3107);
  const pidFile = join(__dirname, '..', '..', '.tmp', `e2e-server-${port}.pid`);
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, 'utf8'));
  rmSync(pidFile);
  try {
    process.kill(pid, 'SIGTERM');
  } catch {
    // already gone
  }
}
