import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from '../sites/shared-schemas';
import { ChannelDto, ChannelListQuery, CreateChannelBody, UpdateChannelBody } from './channels.schemas';
import * as channels from './channels.service';

const StackParams = idParams('stackId');
const ChannelParams = idParams('channelId');

export const channelsRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/stacks/:stackId/channels',
    permission: 'site:read',
    summary: 'Channels of a stack',
    params: StackParams,
    query: ChannelListQuery,
    response: listOf(ChannelDto),
    handler: ({ ctx, params, query }) => channels.listChannels(ctx, params.stackId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/stacks/:stackId/channels',
    permission: 'site:write',
    summary: 'Add a channel to a stack',
    params: StackParams,
    body: CreateChannelBody,
    response: ChannelDto,
    status: 201,
    handler: ({ ctx, params, body }) => channels.createChannel(ctx, params.stackId, body),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/channels/:channelId',
    permission: 'site:write',
    summary: 'Change a channel',
    params: ChannelParams,
    body: UpdateChannelBody,
    response: ChannelDto,
    handler: ({ ctx, params, body }) => channels.updateChannel(ctx, params.channelId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/channels/:channelId/archive',
    permission: 'site:write',
    summary: 'Archive a channel',
    params: ChannelParams,
    body: ArchiveBody,
    response: ChannelDto,
    handler: ({ ctx, params, body }) => channels.archiveChannel(ctx, params.channelId, body?.version),
  }),
];
