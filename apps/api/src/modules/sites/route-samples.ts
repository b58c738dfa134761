/**
 * Request bodies that pass the validation of each mutating route with a body, keyed
 * 'METHOD /path'. The route-table sweeps (tenant isolation, roles) send them so that the answer
 * is about the id or the role, never about the body. A route without a sample fails the sweeps.
 */
export const validBodies: Record<string, unknown> = {
  'POST /api/sites': { name: 'New Works', timeZone: 'Europe/Berlin', country: 'DE', regime: 'eu_ied' },
  'PUT /api/members/:userId/role': { role: 'officer' },
  'PATCH /api/sites/:siteId': { name: 'Taken over', version: 1 },
  'POST /api/sites/:siteId/archive': {},
  'PUT /api/sites/:siteId/members': { userIds: [] },
  'POST /api/sites/:siteId/units': { name: 'Intruder', unitType: 'boiler', ratedThermalInputMWth: 5, inServiceFrom: '2020-01-01' },
  'PATCH /api/units/:unitId': { name: 'Taken over', version: 1 },
  'POST /api/units/:unitId/archive': {},
  'POST /api/sites/:siteId/stacks': { name: 'Intruder' },
  'PATCH /api/stacks/:stackId': { name: 'Taken over', version: 1 },
  'POST /api/stacks/:stackId/archive': {},
  'POST /api/stacks/:stackId/channels': { parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', intervalMinutes: 1 },
  'PATCH /api/channels/:channelId': { rangeMax: 999, version: 1 },
  'POST /api/channels/:channelId/archive': {},
  'POST /api/sites/:siteId/fuels': { name: 'Intruder', fuelType: 'natural_gas' },
  'PATCH /api/fuels/:fuelId': { name: 'Taken over', version: 1 },
  'POST /api/fuels/:fuelId/analyses': { validFrom: '2026-06-01', fFactorSource: 'method19_default' },
  'POST /api/fuels/:fuelId/archive': {},
  'POST /api/sites/:siteId/permits': { reference: 'INTRUDER-1', authority: 'Nobody', effectiveFrom: '2026-01-01' },
  'PATCH /api/permits/:permitId': { authority: 'Taken over', version: 1 },
  'POST /api/permits/:permitId/archive': {},
  'POST /api/permits/:permitId/limits': { stackId: '00000000-0000-4000-8000-000000000000', pollutant: 'CO', elv: 50, unit: 'mg/Nm3', period: 'day' },
  'PATCH /api/limits/:limitId': { elv: 1, version: 1 },
  'PUT /api/imports/:importId/mapping': { columns: [], timestampColumn: 0, intervalConvention: 'interval_end' },
  'POST /api/imports/:importId/commit': {},
  'POST /api/imports/:importId/rollback': { reason: 'sweep check' },
  'POST /api/channels/:channelId/corrections': { from: '2026-01-01T00:00:00Z', to: '2026-01-01T01:00:00Z', action: 'invalidate', reason: 'analyser drift' },
  'POST /api/limits/:limitId/archive': {},
};

