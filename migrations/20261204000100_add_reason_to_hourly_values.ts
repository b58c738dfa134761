import type { Knex } from 'knex';

// Why an hourly value is invalid (the compliance engine's hour reason: fault, calibration,
// quadrant_missing, too_little_valid_time, no_readings …), so the review can say it without
// going back to the readings.
export async function up(knex: Knex): Promise<void> {
  await knex.raw('alter table hourly_values add column reason text');
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('alter table hourly_values drop column if exists reason');
}
