import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// Which members see which sites. Managers see only the sites listed for them; the other roles
// see every site of the organisation.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE site_members (
      tenant_id uuid NOT NULL,
      site_id uuid NOT NULL,
      user_id uuid NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (tenant_id, site_id, user_id),
      FOREIGN KEY (tenant_id, site_id) REFERENCES sites (tenant_id, id) ON DELETE CASCADE,
      -- only members of the organisation can be site members; leaving it ends the site membership
      FOREIGN KEY (tenant_id, user_id) REFERENCES memberships (tenant_id, user_id) ON DELETE CASCADE
    );
    CREATE INDEX site_members_user_idx ON site_members (tenant_id, user_id);
  `);
  await enableTenantRls(knex, 'site_members', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS site_members');
}
