import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from '../sites/shared-schemas';
import { CreateStackBody, StackDto, StackListQuery, StackWithChannelsDto, UpdateStackBody } from './stacks.schemas';
import * as stacks from './stacks.service';

const SiteParams = idParams('siteId');
const StackParams = idParams('stackId');

export const stacksRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId/stacks',
    permission: 'site:read',
    summary: 'Stacks of a site',
    params: SiteParams,
    query: StackListQuery,
    response: listOf(StackDto),
    handler: ({ ctx, params, query }) => stacks.listStacks(ctx, params.siteId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites/:siteId/stacks',
    permission: 'site:write',
    summary: 'Add a stack to a site',
    params: SiteParams,
    body: CreateStackBody,
    response: StackDto,
    status: 201,
    handler: ({ ctx, params, body }) => stacks.createStack(ctx, params.siteId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/stacks/:stackId',
    permission: 'site:read',
    summary: 'A stack with its channels',
    params: StackParams,
    response: StackWithChannelsDto,
    handler: ({ ctx, params }) => stacks.getStack(ctx, params.stackId),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/stacks/:stackId',
    permission: 'site:write',
    summary: 'Change a stack',
    params: StackParams,
    body: UpdateStackBody,
    response: StackDto,
    handler: ({ ctx, params, body }) => stacks.updateStack(ctx, params.stackId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/stacks/:stackId/archive',
    permission: 'site:write',
    summary: 'Archive a stack (its channels and readings stay as history)',
    params: StackParams,
    body: ArchiveBody,
    response: StackDto,
    handler: ({ ctx, params, body }) => stacks.archiveStack(ctx, params.stackId, body?.version),
  }),
];
