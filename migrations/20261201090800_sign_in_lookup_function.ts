import type { Knex } from 'knex';
import { appRole } from './lib/tenancy';

// Sign-in must find an account by e-mail before any user or tenant is known, which the users
// policy does not allow. This owner-run function returns exactly the one row asked for.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create function sign_in_lookup(p_email citext)
    returns table (id uuid, email citext, name text, password_hash text, is_demo boolean, disabled_at timestamptz)
    language sql stable security definer set search_path = public, pg_temp as $$
      select u.id, u.email, u.name, u.password_hash, u.is_demo, u.disabled_at from users u where u.email = p_email
    $$`);
  await knex.raw('revoke all on function sign_in_lookup(citext) from public');
  await knex.raw('grant execute on function sign_in_lookup(citext) to ??', [appRole]);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop function if exists sign_in_lookup(citext)');
}
