// Applies every pending migration as the schema owner (DATABASE_OWNER_URL).
//   node --import tsx apps/api/src/cli/migrate.ts          (run from the repository root)
import knex from 'knex';
import { knexConfig } from '../../../../knexfile';

async function main(): Promise<void> {
  if (!process.env.DATABASE_OWNER_URL) throw new Error('DATABASE_OWNER_URL is not set (see `bash infra/pg.sh url`)');
  const db = knex(knexConfig);
  try {
    const [batch, applied] = (await db.migrate.latest()) as [number, string[]];
    console.log(applied.length ? `[migrate] batch ${batch}: ${applied.join(', ')}` : '[migrate] already up to date');
  } finally {
    await db.destroy();
  }
}

main().catch((error: unknown) => {
  console.error('[migrate] failed:', error);
  process.exit(1);
});
