import type { Knex } from 'knex';

// The one-current-row-per-(channel, t) index without tenant_id in its key. Channel ids are
// globally unique (uuid primary key of channels, each channel belongs to one organisation), so
// (channel_id, t) is as unique as (tenant_id, channel_id, t), and every query of readings names
// its channels (row-level security adds the tenant as a filter). Each entry is a third smaller
// (32 instead of 48 bytes): index writes are most of the cost of committing an import (a month
// of one-minute data for eight channels is 357,120 entries), and they shrink with it.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('create unique index readings_current_channel_t_uq on readings (channel_id, t) where superseded_at is null');
  await knex.raw('drop index readings_current_uq');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('create unique index readings_current_uq on readings (tenant_id, channel_id, t) where superseded_at is null');
  await knex.raw('drop index readings_current_channel_t_uq');
}
