import { defineRoute } from '../../routing/route';
import { ArchiveBody, idParams, listOf } from '../sites/shared-schemas';
import { CreateUnitBody, EmissionUnitDto, UnitListQuery, UpdateUnitBody } from './units.schemas';
import * as units from './units.service';

const SiteParams = idParams('siteId');
const UnitParams = idParams('unitId');

export const unitsRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/sites/:siteId/units',
    permission: 'site:read',
    summary: 'Emission units of a site',
    params: SiteParams,
    query: UnitListQuery,
    response: listOf(EmissionUnitDto),
    handler: ({ ctx, params, query }) => units.listUnits(ctx, params.siteId, query),
  }),
  defineRoute({
    method: 'post',
    path: '/api/sites/:siteId/units',
    permission: 'site:write',
    summary: 'Add an emission unit to a site',
    params: SiteParams,
    body: CreateUnitBody,
    response: EmissionUnitDto,
    status: 201,
    handler: ({ ctx, params, body }) => units.createUnit(ctx, params.siteId, body),
  }),
  defineRoute({
    method: 'get',
    path: '/api/units/:unitId',
    permission: 'site:read',
    summary: 'An emission unit',
    params: UnitParams,
    response: EmissionUnitDto,
    handler: ({ ctx, params }) => units.getUnit(ctx, params.unitId),
  }),
  defineRoute({
    method: 'patch',
    path: '/api/units/:unitId',
    permission: 'site:write',
    summary: 'Change an emission unit',
    params: UnitParams,
    body: UpdateUnitBody,
    response: EmissionUnitDto,
    handler: ({ ctx, params, body }) => units.updateUnit(ctx, params.unitId, body),
  }),
  defineRoute({
    method: 'post',
    path: '/api/units/:unitId/archive',
    permission: 'site:write',
    summary: 'Archive an emission unit',
    params: UnitParams,
    body: ArchiveBody,
    response: EmissionUnitDto,
    handler: ({ ctx, params, body }) => units.archiveUnit(ctx, params.unitId, body?.version),
  }),
];
