import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// A stack's reusable column map: which logger column header (normalised) goes to which channel,
// which header is the timestamp (with its interval convention), which the status, and which
// columns the officer chose to leave out. Next month's file with the same headers maps itself.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table stack_column_maps (
      tenant_id uuid not null,
      stack_id uuid not null,
      header text not null,
      role text not null check (role in ('channel', 'timestamp', 'status', 'ignore')),
      channel_id uuid,
      interval_convention text check (interval_convention in ('interval_end', 'interval_start')),
      updated_by uuid references users (id),
      updated_at timestamptz not null default now(),
      primary key (tenant_id, stack_id, header),
      foreign key (tenant_id, stack_id) references stacks (tenant_id, id),
      foreign key (tenant_id, channel_id) references channels (tenant_id, id),
      check ((role = 'channel') = (channel_id is not null))
    )
  `);
  await enableTenantRls(knex, 'stack_column_maps', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists stack_column_maps');
}
