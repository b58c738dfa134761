// Seeds the invented demo scenario when it is not there yet (idempotent), as the schema owner.
//   node --import tsx apps/api/src/cli/seed.ts              (run from the repository root)
// Refuses NODE_ENV=production: demo accounts have published passwords.
import knex from 'knex';
import { knexConfig } from '../../../../knexfile';

async function main(): Promise<void> {
  if (!process.env.DATABASE_OWNER_URL) throw new Error('DATABASE_OWNER_URL is not set (see `bash infra/pg.sh url`)');
  if (process.env.NODE_ENV === 'production') throw new Error('refusing to seed demo accounts with NODE_ENV=production');
  const db = knex(knexConfig);
  try {
    const [files] = (await db.seed.run()) as [string[]];
    console.log(`[seed] ran ${files.length} seed file(s)`);
  } finally {
    await db.destroy();
  }
}

main().catch((error: unknown) => {
  console.error('[seed] failed:', error);
  process.exit(1);
});
