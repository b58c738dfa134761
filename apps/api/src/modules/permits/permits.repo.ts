import { toDateOnly, toIso, toIsoRequired } from '../sites/db-values';
import type { ListParams } from '../sites/list-query';
import { pageRows } from '../sites/list-query';
import type { SetupCtx } from '../sites/setup-context';
import { findInVisibleSite } from '../sites/site-access';
import type { PermitDto } from './permits.schemas';

export interface PermitRow {
  id: string;
  tenant_id: string;
  site_id: string;
  reference: string;
  authority: string;
  effective_from: Date | string;
  effective_to: Date | string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  archived_at: Date | null;
}

export interface DocumentMetaRow {
  permit_id: string;
  file_name: string;
  size_bytes: number;
  sha256: string;
  uploaded_at: Date;
}

export function toPermitDto(row: PermitRow, doc: DocumentMetaRow | undefined): PermitDto {
  return {
    id: row.id,
    siteId: row.site_id,
    reference: row.reference,
    authority: row.authority,
    effectiveFrom: toDateOnly(row.effective_from) as string,
    effectiveTo: toDateOnly(row.effective_to),
    document: doc
      ? { fileName: doc.file_name, sizeBytes: doc.size_bytes, sha256: doc.sha256.trim(), uploadedAt: toIsoRequired(doc.uploaded_at) }
      : null,
    archivedAt: toIso(row.archived_at),
    version: row.version,
    createdAt: toIsoRequired(row.created_at),
    updatedAt: toIsoRequired(row.updated_at),
  };
}

export const findVisiblePermit = (ctx: SetupCtx, permitId: string) => findInVisibleSite<PermitRow>(ctx, 'permits', permitId);

export async function listPermitsOfSite(ctx: SetupCtx, siteId: string, params: ListParams) {
  const base = ctx.db('permits').where({ tenant_id: ctx.tenantId, site_id: siteId }).select('*');
  return pageRows<PermitRow>(base, params, {
    sortColumns: { reference: 'reference', authority: 'authority', effectiveFrom: 'effective_from', createdAt: 'created_at' },
    searchColumns: ['reference', 'authority'],
    archivedColumn: 'archived_at',
    idColumn: 'id',
  });
}

/** Metadata of the current document of each permit (never the bytes). */
export async function currentDocuments(ctx: SetupCtx, permitIds: string[]): Promise<Map<string, DocumentMetaRow>> {
  const byPermit = new Map<string, DocumentMetaRow>();
  if (permitIds.length === 0) return byPermit;
  const rows = (await ctx
    .db('permit_documents')
    .where({ tenant_id: ctx.tenantId })
    .whereIn('permit_id', permitIds)
    .whereNull('replaced_at')
    .select('permit_id', 'file_name', 'size_bytes', 'sha256', 'uploaded_at')) as DocumentMetaRow[];
  for (const r of rows) byPermit.set(r.permit_id, r);
  return byPermit;
}

export async function currentDocumentContent(ctx: SetupCtx, permitId: string) {
  return (await ctx
    .db('permit_documents')
    .where({ tenant_id: ctx.tenantId, permit_id: permitId })
    .whereNull('replaced_at')
    .first('file_name', 'media_type', 'size_bytes', 'sha256', 'content')) as
    | { file_name: string; media_type: string; size_bytes: number; sha256: string; content: Buffer }
    | undefined;
}

/** Stores a new current document; the previous one stays, marked replaced. */
export async function replaceDocument(
  ctx: SetupCtx,
  permitId: string,
  doc: { fileName: string; sizeBytes: number; sha256: string; content: Buffer },
): Promise<void> {
  await ctx
    .db('permit_documents')
    .where({ tenant_id: ctx.tenantId, permit_id: permitId })
    .whereNull('replaced_at')
    .update({ replaced_at: ctx.db.fn.now() });
  await ctx.db('permit_documents').insert({
    tenant_id: ctx.tenantId,
    permit_id: permitId,
    file_name: doc.fileName,
    media_type: 'application/pdf',
    size_bytes: doc.sizeBytes,
    sha256: doc.sha256,
    content: doc.content,
    uploaded_by: ctx.userId,
  });
}
