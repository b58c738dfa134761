import { z } from 'zod';
import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from './shared-schemas';
import { CreateSiteBody, SiteDetailDto, SiteDto, SiteListQuery, SiteMemberDto, SiteMembersBody, UpdateSiteBody } from './sites.schemas';
import * as sites from './sites.service';

const SiteParams = idParams('siteId');
const SiteMembersDto = z.object({ items: z.array(SiteMemberDto) });

export const sitesRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/sites',
    permission: 'site:read',
    summary: 'Sites of the organisation (a manager: only their sites)',
    query: SiteListQuery,
    response: listOf(SiteDto),
    handler: ({ ctx, query }) => sites.list(ctx, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites',
    permission: 'site:write',
    summary: 'Add a site',
    body: CreateSiteBody,
    response: SiteDto,
    status: 201,
    handler: ({ ctx, body }) => sites.create(ctx, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId',
    permission: 'site:read',
    summary: 'A site with its units, stacks (with channels), fuels and counts',
    params: SiteParams,
    response: SiteDetailDto,
    handler: ({ ctx, params }) => sites.get(ctx, params.siteId),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/sites/:siteId',
    permission: 'site:write',
    summary: 'Change a site',
    params: SiteParams,
    body: UpdateSiteBody,
    response: SiteDto,
    handler: ({ ctx, params, body }) => sites.update(ctx, params.siteId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites/:siteId/archive',
    permission: 'site:write',
    summary: 'Archive a site',
    params: SiteParams,
    body: ArchiveBody,
    response: SiteDto,
    handler: ({ ctx, params, body }) => sites.archive(ctx, params.siteId, body?.version),
  }),
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId/members',
    permission: 'site:read',
    summary: 'Members given access to a site',
    params: SiteParams,
    response: SiteMembersDto,
    handler: async ({ ctx, params }) => ({ items: await sites.members(ctx, params.siteId) }),
  }),
  defineRoute({
    method: 'put',
    path: '/api/sites/:siteId/members',
    permission: 'members:manage',
    summary: 'Set which members have access to a site',
    params: SiteParams,
    body: SiteMembersBody,
    response: SiteMembersDto,
    handler: async ({ ctx, params, body }) => ({ items: await sites.replaceMembers(ctx, params.siteId, body.userIds) }),
  }),
];
