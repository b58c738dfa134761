import { defineRoute } from '../../routing/route';
import { correctReadings } from './corrections.service';
import { getReadings } from './drilldown.service';
import { ChannelParams, CorrectionBody, CorrectionResultDto, ReadingsDto, ReadingsQuery, ReviewDto, ReviewQuery, StackParams } from './review.schemas';
import { getReview } from './review.service';

export const reviewRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/stacks/:stackId/review',
    permission: 'data:read',
    summary: "A stack's hourly and daily values, limit verdicts, availability, headroom and plausibility over a period",
    params: StackParams,
    query: ReviewQuery,
    response: ReviewDto,
    handler: ({ ctx, params, query }) => getReview(ctx, params.stackId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/api/channels/:channelId/readings',
    permission: 'data:read',
    summary: "A channel's raw readings over a range (optionally with superseded rows), their imports and hourly values",
    params: ChannelParams,
    query: ReadingsQuery,
    response: ReadingsDto,
    handler: ({ ctx, params, query }) => getReadings(ctx, params.channelId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/channels/:channelId/corrections',
    permission: 'data:correct',
    summary: "Invalidate or substitute a channel's readings over a range, with a reason",
    params: ChannelParams,
    body: CorrectionBody,
    response: CorrectionResultDto,
    status: 201,
    handler: ({ ctx, params, body }) => correctReadings(ctx, params.channelId, body),
  }),
];
