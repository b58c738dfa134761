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
    // Raw, to answer 304 before the review is built; the 200 body is still parsed by ReviewDto.
    // It leaves inside the request's transaction: its only writes are lazily recomputed limit
    // hours, which a failed commit merely leaves to be recomputed on the next read.
    response: 'raw',
    handler: async ({ ctx, params, query, req, res }) => {
      const answer = await getReview(ctx, params.stackId, query, { ifNoneMatch: req.get('if-none-match') });
      // The browser keeps its copy but asks every time (no-cache): the tag answers in a few queries.
      res.set({ ETag: answer.etag, 'Cache-Control': 'private, no-cache' });
      if (answer.notModified) res.status(304).end();
      else res.status(200).json(ReviewDto.parse(answer.review));
    },
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
