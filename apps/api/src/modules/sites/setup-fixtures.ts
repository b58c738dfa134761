/**
 * Test fixtures for the set-up modules: a complete site tree (site, fuel with analysis, unit,
 * stack, channel, permit, limit) written through the services, as an officer of the organisation.
 */
import type { Knex } from 'knex';
import { withScope } from '../../lib/db';
import type { TestOrganisation } from '../../test-support/fixtures';
import { CreateChannelBody } from '../channels/channels.schemas';
import * as channels from '../channels/channels.service';
import { CreateFuelBody } from '../fuels/fuels.schemas';
import * as fuels from '../fuels/fuels.service';
import { CreateLimitBody } from '../permits/limits.schemas';
import * as limits from '../permits/limits.service';
import { CreatePermitBody } from '../permits/permits.schemas';
import * as permits from '../permits/permits.service';
import { CreateStackBody } from '../stacks/stacks.schemas';
import * as stacks from '../stacks/stacks.service';
import { CreateUnitBody } from '../units/units.schemas';
import * as units from '../units/units.service';
import type { SetupCtx } from './setup-context';
import { CreateSiteBody } from './sites.schemas';
import * as sites from './sites.service';

export interface SiteTree {
  siteId: string;
  fuelId: string;
  unitId: string;
  stackId: string;
  channelId: string;
  permitId: string;
  limitId: string;
}

/** Runs work as a member of the organisation through the app role, like a request would. */
export function asMember<T>(db: Knex, org: TestOrganisation, role: 'admin' | 'officer' | 'manager' | 'auditor', work: (ctx: SetupCtx) => Promise<T>): Promise<T> {
  const userId = org.users[role].id;
  return withScope(db, { tenantId: org.id, userId }, (trx) =>
    work({ tenantId: org.id, userId, role, db: trx, requestId: 'test-fixture' }),
  );
}

/** A natural-gas boiler site with one of everything. */
export function buildSiteTree(db: Knex, org: TestOrganisation, name = 'Fixture Works'): Promise<SiteTree> {
  return asMember(db, org, 'officer', async (ctx) => {
    const site = await sites.create(ctx, CreateSiteBody.parse({ name, timeZone: 'Europe/Berlin', country: 'DE', regime: 'eu_ied' }));
    const fuel = await fuels.createFuel(
      ctx,
      site.id,
      CreateFuelBody.parse({
        name: 'Pipeline gas',
        fuelType: 'natural_gas',
        analysis: { validFrom: '2026-01-01', composition: { CH4: 95, C2H6: 3, N2: 1.5, CO2: 0.5 } },
      }),
    );
    const unit = await units.createUnit(
      ctx,
      site.id,
      CreateUnitBody.parse({ name: 'Boiler A', unitType: 'boiler', ratedThermalInputMWth: 20, inServiceFrom: '2010-05-01', fuelIds: [fuel.id] }),
    );
    const stack = await stacks.createStack(ctx, site.id, CreateStackBody.parse({ name: 'Stack A', heightM: 40, unitIds: [unit.id] }));
    const channel = await channels.createChannel(
      ctx,
      stack.id,
      CreateChannelBody.parse({ parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 400, intervalMinutes: 1 }),
    );
    const permit = await permits.createPermit(
      ctx,
      site.id,
      CreatePermitBody.parse({ reference: `FX-${site.id.slice(0, 8)}`, authority: 'Fixture Authority', effectiveFrom: '2025-01-01' }),
    );
    const limit = await limits.createLimit(
      ctx,
      permit.id,
      CreateLimitBody.parse({ stackId: stack.id, pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', period: 'day', criterion: { type: 'every_period', factor: 1.1 }, confidenceIntervalPercent: 20 }),
    );
    return { siteId: site.id, fuelId: fuel.id, unitId: unit.id, stackId: stack.id, channelId: channel.id, permitId: permit.id, limitId: limit.id };
  });
}

/** Audit rows of an entity, newest last (read as the owner scoped to the tenant). */
export async function auditRows(db: Knex, org: TestOrganisation, entityId: string) {
  return asMember(db, org, 'admin', (ctx) =>
    ctx.db('audit_log').where({ tenant_id: org.id, entity_id: entityId }).orderBy('id').select('action', 'entity', 'before', 'after', 'actor_user_id'),
  );
}
