import type { Knex } from 'knex';
import { enableTenantRls } from './lib/tenancy';

// One row per uploaded file: what it was (name, SHA-256, size), how it is read (timestamp column,
// interval convention, declared period, column mapping), what it did (counts, span) and where a
// running commit is (progress_*, written from a separate connection so polling sees it).
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    create table imports (
      id uuid primary key default gen_random_uuid(),
      tenant_id uuid not null references organisations (id) on delete restrict,
      stack_id uuid not null,
      file_name text not null,
      sha256 text not null check (sha256 ~ '^[0-9a-f]{64}$'),
      size_bytes bigint not null check (size_bytes >= 0),
      format text not null check (format in ('xlsx', 'csv')),
      sheet_name text,
      uploaded_by uuid not null references users (id),
      uploaded_at timestamptz not null default now(),
      state text not null default 'parsed'
        check (state in ('parsed', 'mapped', 'committing', 'committed', 'rolled_back', 'failed')),
      header_row integer,
      timestamp_column integer not null,
      timestamp_header text not null,
      status_column integer,
      interval_convention text not null default 'interval_end' check (interval_convention in ('interval_end', 'interval_start')),
      interval_seconds integer,
      period_from date,
      period_to date,
      columns jsonb not null default '[]',
      mapping jsonb not null default '[]',
      notes jsonb not null default '[]',
      row_count integer not null default 0,
      cell_count integer not null default 0,
      problem_count integer not null default 0,
      problem_counts jsonb not null default '{}',
      duplicate_rows integer not null default 0,
      inserted_count integer,
      unchanged_count integer,
      superseded_count integer,
      conflict_count integer,
      span_from timestamptz,
      span_to timestamptz,
      committed_at timestamptz,
      committed_by uuid references users (id),
      replace_reason text,
      rolled_back_at timestamptz,
      rolled_back_by uuid references users (id),
      rollback_reason text,
      progress_phase text,
      progress_done bigint,
      progress_total bigint,
      progress_updated_at timestamptz,
      failure_message text,
      unique (tenant_id, id),
      foreign key (tenant_id, stack_id) references stacks (tenant_id, id),
      check (period_from is null or period_to is null or period_from <= period_to)
    )
  `);
  await knex.raw('create index imports_stack_idx on imports (tenant_id, stack_id, uploaded_at desc)');
  await knex.raw('create index imports_stack_sha_idx on imports (tenant_id, stack_id, sha256)');
  await enableTenantRls(knex, 'imports', { index: false });
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop table if exists imports');
}
