/**
 * Test and benchmark fixtures for imports: a boiler stack with the eight channels of the demo
 * logger export, and the demo month as bytes.
 */
import type { Knex } from 'knex';
import type { TestOrganisation } from '../../test-support/fixtures';
import { CreateChannelBody } from '../channels/channels.schemas';
import * as channels from '../channels/channels.service';
import { asMember, buildSiteTree } from '../sites/setup-fixtures';

export interface DemoStack {
  siteId: string;
  stackId: string;
  /** Channel id by parameter (NOx, CO, SO2, O2, H2O, flow, temperature, load). */
  channelIds: Record<string, string>;
}

const extraChannels = [
  { parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', intervalMinutes: 1 },
  { parameter: 'SO2', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', intervalMinutes: 1 },
  { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', intervalMinutes: 1 },
  { parameter: 'H2O', unit: '%', basis: 'wet', conditions: 'standard', intervalMinutes: 1 },
  { parameter: 'flow', unit: 'Nm3/h', basis: 'wet', conditions: 'standard', intervalMinutes: 1 },
  { parameter: 'temperature', unit: 'degC', basis: 'wet', conditions: 'actual', intervalMinutes: 1 },
  { parameter: 'load', unit: 'MW', basis: 'wet', conditions: 'actual', intervalMinutes: 1 },
] as const;

/** A site in Europe/Berlin with one stack and the demo's eight channels (NOx comes with the tree). */
export async function createDemoStack(db: Knex, org: TestOrganisation, name = 'Import Works'): Promise<DemoStack> {
  const tree = await buildSiteTree(db, org, name);
  const channelIds: Record<string, string> = { NOx: tree.channelId };
  await asMember(db, org, 'officer', async (ctx) => {
    for (const body of extraChannels) {
      const created = await channels.createChannel(ctx, tree.stackId, CreateChannelBody.parse(body));
      channelIds[body.parameter] = created.id;
    }
  });
  return { siteId: tree.siteId, stackId: tree.stackId, channelIds };
}

export { demoWorkbookBytes } from './demo-data';
