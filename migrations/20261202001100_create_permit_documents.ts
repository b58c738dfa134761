import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// The permit's PDF. Replacing it keeps the earlier file (replaced_at set) so the document an
// earlier report relied on can still be produced; one current document per permit.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE permit_documents (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      tenant_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
      permit_id uuid NOT NULL,
      file_name text NOT NULL,
      media_type text NOT NULL CHECK (media_type = 'application/pdf'),
      size_bytes integer NOT NULL CHECK (size_bytes > 0 AND size_bytes <= 20971520),
      sha256 char(64) NOT NULL,
      content bytea NOT NULL,
      uploaded_by uuid REFERENCES users (id) ON DELETE SET NULL,
      uploaded_at timestamptz NOT NULL DEFAULT now(),
      replaced_at timestamptz,
      UNIQUE (tenant_id, id),
      FOREIGN KEY (tenant_id, permit_id) REFERENCES permits (tenant_id, id)
    );
    CREATE UNIQUE INDEX permit_documents_current_uq ON permit_documents (permit_id) WHERE replaced_at IS NULL;
  `);
  await enableTenantRls(knex, 'permit_documents');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TABLE IF EXISTS permit_documents');
}
