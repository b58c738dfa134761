import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from '../sites/shared-schemas';
import { AnalysisListQuery, CreateAnalysisBody, CreateFuelBody, FuelAnalysisDto, FuelDto, FuelListQuery, UpdateFuelBody } from './fuels.schemas';
import * as fuels from './fuels.service';

const SiteParams = idParams('siteId');
const FuelParams = idParams('fuelId');

export const fuelsRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId/fuels',
    permission: 'site:read',
    summary: 'Fuels of a site, each with its current analysis',
    params: SiteParams,
    query: FuelListQuery,
    response: listOf(FuelDto),
    handler: ({ ctx, params, query }) => fuels.listFuels(ctx, params.siteId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites/:siteId/fuels',
    permission: 'site:write',
    summary: 'Add a fuel with its first analysis',
    params: SiteParams,
    body: CreateFuelBody,
    response: FuelDto,
    status: 201,
    handler: ({ ctx, params, body }) => fuels.createFuel(ctx, params.siteId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/fuels/:fuelId',
    permission: 'site:read',
    summary: 'A fuel with its current analysis',
    params: FuelParams,
    response: FuelDto,
    handler: ({ ctx, params }) => fuels.getFuel(ctx, params.fuelId),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/fuels/:fuelId',
    permission: 'site:write',
    summary: "Change a fuel's name or type",
    params: FuelParams,
    body: UpdateFuelBody,
    response: FuelDto,
    handler: ({ ctx, params, body }) => fuels.updateFuel(ctx, params.fuelId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/fuels/:fuelId/analyses',
    permission: 'site:read',
    summary: 'Analysis history of a fuel',
    params: FuelParams,
    query: AnalysisListQuery,
    response: listOf(FuelAnalysisDto),
    handler: ({ ctx, params, query }) => fuels.listAnalyses(ctx, params.fuelId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/fuels/:fuelId/analyses',
    permission: 'site:write',
    summary: 'Add an analysis to a fuel (F-factors computed server-side)',
    params: FuelParams,
    body: CreateAnalysisBody,
    response: FuelAnalysisDto,
    status: 201,
    handler: ({ ctx, params, body }) => fuels.addAnalysis(ctx, params.fuelId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/fuels/:fuelId/archive',
    permission: 'site:write',
    summary: 'Archive a fuel',
    params: FuelParams,
    body: ArchiveBody,
    response: FuelDto,
    handler: ({ ctx, params, body }) => fuels.archiveFuel(ctx, params.fuelId, body?.version),
  }),
];
