import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';

export default async function globalTeardown(): Promise<void> {
  const pidFile = join(__dirname, '..', '..', '.tmp', 'e2e-server.pid');
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, 'utf8'));
  rmSync(pidFile);
  try {
    process.kill(pid, 'SIGTERM');
  } catch {
    // already gone
  }
}
