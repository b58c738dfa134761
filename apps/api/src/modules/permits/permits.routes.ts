import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from '../sites/shared-schemas';
import { limitDefaults } from './limit-defaults';
import { CreateLimitBody, LimitDefaultsDto, LimitDefaultsQuery, LimitDto, LimitListQuery, UpdateLimitBody } from './limits.schemas';
import * as limits from './limits.service';
import { readPermitPdf } from './permit-upload';
import { CreatePermitBody, PermitDetailDto, PermitDto, PermitListQuery, UpdatePermitBody } from './permits.schemas';
import * as permits from './permits.service';

const SiteParams = idParams('siteId');
const PermitParams = idParams('permitId');
const LimitParams = idParams('limitId');

/** RFC 6266 / RFC 5987 Content-Disposition with a safe ASCII fallback name. */
function attachment(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]|["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

export const permitsRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId/permits',
    permission: 'site:read',
    summary: 'Permits of a site',
    params: SiteParams,
    query: PermitListQuery,
    response: listOf(PermitDto),
    handler: ({ ctx, params, query }) => permits.listPermits(ctx, params.siteId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites/:siteId/permits',
    permission: 'site:write',
    summary: 'Add a permit to a site',
    params: SiteParams,
    body: CreatePermitBody,
    response: PermitDto,
    status: 201,
    handler: ({ ctx, params, body }) => permits.createPermit(ctx, params.siteId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/permits/:permitId',
    permission: 'site:read',
    summary: 'A permit with its limits',
    params: PermitParams,
    response: PermitDetailDto,
    handler: ({ ctx, params }) => permits.getPermit(ctx, params.permitId),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/permits/:permitId',
    permission: 'site:write',
    summary: 'Change a permit',
    params: PermitParams,
    body: UpdatePermitBody,
    response: PermitDto,
    handler: ({ ctx, params, body }) => permits.updatePermit(ctx, params.permitId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/permits/:permitId/archive',
    permission: 'site:write',
    summary: 'Archive a permit',
    params: PermitParams,
    body: ArchiveBody,
    response: PermitDto,
    handler: ({ ctx, params, body }) => permits.archivePermit(ctx, params.permitId, body?.version),
  }),
  defineRoute({
    method: 'put',
    path: '/api/permits/:permitId/document',
    permission: 'site:write',
    summary: 'Upload the permit PDF (multipart field "file", at most 20 MB)',
    params: PermitParams,
    response: PermitDto,
    handler: async ({ ctx, params, req, res }) => {
      // 404 before reading the upload: another organisation's permit costs no upload
      await permits.visiblePermit(ctx, params.permitId);
      const file = await readPermitPdf(req, res);
      return permits.storePermitDocument(ctx, params.permitId, file);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/permits/:permitId/document',
    permission: 'site:read',
    summary: 'Download the permit PDF',
    params: PermitParams,
    response: 'raw',
    handler: async ({ ctx, params, res }) => {
      const doc = await permits.permitDocument(ctx, params.permitId);
      res
        .status(200)
        .type('application/pdf')
        .set('Content-Disposition', attachment(doc.file_name))
        .set('Content-Length', String(doc.content.length))
        .set('ETag', `"${doc.sha256.trim()}"`)
        .end(doc.content);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/permits/:permitId/limits',
    permission: 'site:read',
    summary: 'Limits of a permit',
    params: PermitParams,
    query: LimitListQuery,
    response: listOf(LimitDto),
    handler: ({ ctx, params, query }) => limits.listLimits(ctx, params.permitId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/permits/:permitId/limits',
    permission: 'site:write',
    summary: 'Add a limit to a permit',
    params: PermitParams,
    body: CreateLimitBody,
    response: LimitDto,
    status: 201,
    handler: ({ ctx, params, body }) => limits.createLimit(ctx, params.permitId, body),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/limits/:limitId',
    permission: 'site:write',
    summary: 'Change a limit',
    params: LimitParams,
    body: UpdateLimitBody,
    response: LimitDto,
    handler: ({ ctx, params, body }) => limits.updateLimit(ctx, params.limitId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/limits/:limitId/archive',
    permission: 'site:write',
    summary: 'Archive a limit',
    params: LimitParams,
    body: ArchiveBody,
    response: LimitDto,
    handler: ({ ctx, params, body }) => limits.archiveLimit(ctx, params.limitId, body?.version),
  }),
  defineRoute({
    method: 'get',
    path: '/api/limit-defaults',
    permission: 'site:read',
    summary: 'Default reference and ambient O2 for a new limit (IED Annex V Part 1; 40 CFR 60)',
    query: LimitDefaultsQuery,
    response: LimitDefaultsDto,
    handler: ({ query }) => limitDefaults(query),
  }),
];
