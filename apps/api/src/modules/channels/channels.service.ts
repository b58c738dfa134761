import type { ListParams } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { audit, conflict, notFound, unprocessable } from '../sites/setup-context';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import { visibleStack } from '../stacks/stacks.service';
import type { ChannelRow } from './channels.repo';
import { findVisibleChannel, listChannelsOfStack, toChannelDto } from './channels.repo';
import type { ChannelDto, CreateChannelBody, UpdateChannelBody } from './channels.schemas';
import { channelIssues } from './channels.schemas';

const ENTITY = 'channel';

function isUniqueViolation(error: unknown): boolean {
  return typeof error === 'object' && error !== null && (error as { code?: string }).code === '23505';
}

const duplicate = (parameter: string, basis: string) =>
  conflict('channel_exists', `This stack already has a ${parameter} channel on a ${basis} basis`);

async function visibleChannel(ctx: SetupCtx, channelId: string) {
  const row = await findVisibleChannel(ctx, channelId);
  if (!row) throw notFound('Channel');
  return row;
}

/** Runs a write, turning the live-channel uniqueness index into a 409 with a clear message. */
async function guardDuplicate<T>(ctx: SetupCtx, parameter: string, basis: string, write: () => Promise<T>): Promise<T> {
  // A savepoint keeps the request transaction usable after the violation.
  const savepoint = 'channel_write';
  await ctx.db.raw(`SAVEPOINT ${savepoint}`);
  try {
    const result = await write();
    await ctx.db.raw(`RELEASE SAVEPOINT ${savepoint}`);
    return result;
  } catch (error) {
    await ctx.db.raw(`ROLLBACK TO SAVEPOINT ${savepoint}`);
    if (isUniqueViolation(error)) throw duplicate(parameter, basis);
    throw error;
  }
}

export async function listChannels(ctx: SetupCtx, stackId: string, params: ListParams) {
  await visibleStack(ctx, stackId);
  const { rows, total } = await listChannelsOfStack(ctx, stackId, params);
  return { items: rows.map(toChannelDto), total };
}

export async function createChannel(ctx: SetupCtx, stackId: string, body: CreateChannelBody): Promise<ChannelDto> {
  const stack = await visibleStack(ctx, stackId);
  assertLive(stack, 'stack');
  const row = await guardDuplicate(ctx, body.parameter, body.basis, async () => {
    const [inserted] = (await ctx
      .db('channels')
      .insert({
        tenant_id: ctx.tenantId,
        stack_id: stackId,
        parameter: body.parameter,
        unit: body.unit,
        basis: body.basis,
        conditions: body.conditions,
        range_min: body.rangeMin ?? null,
        range_max: body.rangeMax ?? null,
        interval_minutes: body.intervalMinutes,
        source_label: body.sourceLabel ?? null,
      })
      .returning('*')) as ChannelRow[];
    return inserted;
  });
  const after = toChannelDto(row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function updateChannel(ctx: SetupCtx, channelId: string, body: UpdateChannelBody): Promise<ChannelDto> {
  const current = await visibleChannel(ctx, channelId);
  assertLive(current, 'channel');
  assertVersion(current, body.version, 'channel');
  const before = toChannelDto(current);
  const merged = {
    parameter: body.parameter ?? before.parameter,
    unit: body.unit ?? before.unit,
    basis: body.basis ?? before.basis,
    rangeMin: body.rangeMin === undefined ? before.rangeMin : body.rangeMin,
    rangeMax: body.rangeMax === undefined ? before.rangeMax : body.rangeMax,
  };
  const issues = channelIssues(merged);
  if (issues.length > 0) throw unprocessable('The channel would not be consistent', issues);
  const patch: Record<string, unknown> = {};
  if (body.parameter !== undefined) patch.parameter = body.parameter;
  if (body.unit !== undefined) patch.unit = body.unit;
  if (body.basis !== undefined) patch.basis = body.basis;
  if (body.conditions !== undefined) patch.conditions = body.conditions;
  if (body.rangeMin !== undefined) patch.range_min = body.rangeMin;
  if (body.rangeMax !== undefined) patch.range_max = body.rangeMax;
  if (body.intervalMinutes !== undefined) patch.interval_minutes = body.intervalMinutes;
  if (body.sourceLabel !== undefined) patch.source_label = body.sourceLabel;
  const row = await guardDuplicate(ctx, merged.parameter, merged.basis, () =>
    updateVersioned<ChannelRow>(ctx, 'channels', channelId, body.version, patch, 'channel'),
  );
  const after = toChannelDto(row);
  await audit(ctx, 'updated', ENTITY, channelId, before, after);
  return after;
}

export async function archiveChannel(ctx: SetupCtx, channelId: string, version?: number): Promise<ChannelDto> {
  const current = await visibleChannel(ctx, channelId);
  assertVersion(current, version, 'channel');
  if (current.archived_at) return toChannelDto(current);
  const before = toChannelDto(current);
  const after = toChannelDto(await archiveRow<ChannelRow>(ctx, 'channels', current));
  await audit(ctx, 'archived', ENTITY, channelId, before, after);
  return after;
}
