import { createHash } from 'node:crypto';
import type { ListParams } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { audit, conflict, notFound, unprocessable } from '../sites/setup-context';
import { findVisibleSite } from '../sites/sites.repo';
import { archiveRow, assertLive, assertVersion, updateVersioned } from '../sites/versioned';
import { liveLimitsOfPermit, toLimitDto } from './limits.repo';
import type { PermitRow } from './permits.repo';
import {
  currentDocumentContent,
  currentDocuments,
  findVisiblePermit,
  listPermitsOfSite,
  replaceDocument,
  toPermitDto,
} from './permits.repo';
import type { CreatePermitBody, PermitDetailDto, PermitDto, UpdatePermitBody } from './permits.schemas';

const ENTITY = 'permit';

async function dto(ctx: SetupCtx, row: PermitRow): Promise<PermitDto> {
  return toPermitDto(row, (await currentDocuments(ctx, [row.id])).get(row.id));
}

export async function visiblePermit(ctx: SetupCtx, permitId: string): Promise<PermitRow> {
  const row = await findVisiblePermit(ctx, permitId);
  if (!row) throw notFound('Permit');
  return row;
}

const isUniqueViolation = (error: unknown) => (error as { code?: string } | null)?.code === '23505';
const duplicateReference = (reference: string) =>
  conflict('permit_reference_exists', `This site already has a permit with the reference ${reference}`);

async function guardReference<T>(ctx: SetupCtx, reference: string, write: () => Promise<T>): Promise<T> {
  await ctx.db.raw('SAVEPOINT permit_write');
  try {
    const result = await write();
    await ctx.db.raw('RELEASE SAVEPOINT permit_write');
    return result;
  } catch (error) {
    await ctx.db.raw('ROLLBACK TO SAVEPOINT permit_write');
    if (isUniqueViolation(error)) throw duplicateReference(reference);
    throw error;
  }
}

export async function listPermits(ctx: SetupCtx, siteId: string, params: ListParams) {
  if (!(await findVisibleSite(ctx, siteId))) throw notFound('Site');
  const { rows, total } = await listPermitsOfSite(ctx, siteId, params);
  const docs = await currentDocuments(ctx, rows.map((r) => r.id));
  return { items: rows.map((r) => toPermitDto(r, docs.get(r.id))), total };
}

export async function getPermit(ctx: SetupCtx, permitId: string): Promise<PermitDetailDto> {
  const row = await visiblePermit(ctx, permitId);
  return { ...(await dto(ctx, row)), limits: (await liveLimitsOfPermit(ctx, permitId)).map(toLimitDto) };
}

export async function createPermit(ctx: SetupCtx, siteId: string, body: CreatePermitBody): Promise<PermitDto> {
  const site = await findVisibleSite(ctx, siteId);
  if (!site) throw notFound('Site');
  assertLive(site, 'site');
  const row = await guardReference(ctx, body.reference, async () => {
    const [inserted] = (await ctx
      .db('permits')
      .insert({
        tenant_id: ctx.tenantId,
        site_id: siteId,
        reference: body.reference,
        authority: body.authority,
        effective_from: body.effectiveFrom,
        effective_to: body.effectiveTo ?? null,
      })
      .returning('*')) as PermitRow[];
    return inserted;
  });
  const after = await dto(ctx, row);
  await audit(ctx, 'created', ENTITY, row.id, null, after);
  return after;
}

export async function updatePermit(ctx: SetupCtx, permitId: string, body: UpdatePermitBody): Promise<PermitDto> {
  const current = await visiblePermit(ctx, permitId);
  assertLive(current, 'permit');
  assertVersion(current, body.version, 'permit');
  const before = await dto(ctx, current);
  const effectiveFrom = body.effectiveFrom ?? before.effectiveFrom;
  const effectiveTo = body.effectiveTo === undefined ? before.effectiveTo : body.effectiveTo;
  if (effectiveTo && effectiveTo < effectiveFrom) {
    throw unprocessable('The permit ends before it starts', [{ path: 'effectiveTo', message: 'Must not be before the effective-from date' }]);
  }
  const patch: Record<string, unknown> = {};
  if (body.reference !== undefined) patch.reference = body.reference;
  if (body.authority !== undefined) patch.authority = body.authority;
  if (body.effectiveFrom !== undefined) patch.effective_from = body.effectiveFrom;
  if (body.effectiveTo !== undefined) patch.effective_to = body.effectiveTo;
  const row = await guardReference(ctx, body.reference ?? current.reference, () =>
    updateVersioned<PermitRow>(ctx, 'permits', permitId, body.version, patch, 'permit'),
  );
  const after = await dto(ctx, row);
  await audit(ctx, 'updated', ENTITY, permitId, before, after);
  return after;
}

export async function archivePermit(ctx: SetupCtx, permitId: string, version?: number): Promise<PermitDto> {
  const current = await visiblePermit(ctx, permitId);
  assertVersion(current, version, 'permit');
  if (current.archived_at) return dto(ctx, current);
  const before = await dto(ctx, current);
  const after = await dto(ctx, await archiveRow(ctx, 'permits', current));
  await audit(ctx, 'archived', ENTITY, permitId, before, after);
  return after;
}

/** A PDF starts with "%PDF-" (ISO 32000-1 §7.5.2, file header). */
export const isPdf = (content: Buffer): boolean => content.subarray(0, 5).toString('latin1') === '%PDF-';

export async function storePermitDocument(
  ctx: SetupCtx,
  permitId: string,
  file: { originalName: string; content: Buffer },
): Promise<PermitDto> {
  const permit = await visiblePermit(ctx, permitId);
  assertLive(permit, 'permit');
  const before = await dto(ctx, permit);
  const sha256 = createHash('sha256').update(file.content).digest('hex');
  const fileName = file.originalName.replace(/[\\/\r\n"]/g, '_').slice(0, 255) || 'permit.pdf';
  await replaceDocument(ctx, permitId, { fileName, sizeBytes: file.content.length, sha256, content: file.content });
  const after = await dto(ctx, permit);
  await audit(ctx, 'document_uploaded', ENTITY, permitId, before.document, after.document);
  return after;
}

export async function permitDocument(ctx: SetupCtx, permitId: string) {
  await visiblePermit(ctx, permitId);
  const doc = await currentDocumentContent(ctx, permitId);
  if (!doc) throw notFound('Permit document');
  return doc;
}
