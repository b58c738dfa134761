import { z } from 'zod';
import { FuelDto } from '../fuels/fuels.schemas';
import { StackWithChannelsDto } from '../stacks/stacks.schemas';
import { EmissionUnitDto } from '../units/units.schemas';
import { listQuery } from './list-query';
import { Id, Name, Version } from './shared-schemas';

export const REGIMES = ['eu_ied', 'us_epa', 'other'] as const;
export type Regime = (typeof REGIMES)[number];

/** An IANA zone name the runtime knows ("Europe/Berlin", "UTC"), stored in its canonical spelling. */
export const TimeZone = z
  .string()
  .trim()
  .regex(/^[A-Za-z_]+(\/[A-Za-z0-9_+-]+)*$/, 'Use an IANA time zone such as Europe/Berlin')
  .transform((zone, ctx) => {
    try {
      return new Intl.DateTimeFormat('en', { timeZone: zone }).resolvedOptions().timeZone;
    } catch {
      ctx.addIssue({ code: 'custom', message: `Unknown time zone ${zone}` });
      return z.NEVER;
    }
  });

const regionNames = new Intl.DisplayNames(['en'], { type: 'region' });
/** ISO 3166-1 alpha-2 country code, upper case. */
export const CountryCode = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{2}$/, 'Use a two-letter ISO 3166-1 country code')
  .refine((code) => {
    const name = regionNames.of(code);
    return name !== undefined && name !== code && name !== 'Unknown Region';
  }, 'Unknown country code');

export const CreateSiteBody = z.object({
  name: Name,
  timeZone: TimeZone,
  country: CountryCode,
  regime: z.enum(REGIMES),
  address: z.string().trim().max(1000).nullish(),
});
export type CreateSiteBody = z.infer<typeof CreateSiteBody>;

export const UpdateSiteBody = CreateSiteBody.partial().extend({ version: Version });
export type UpdateSiteBody = z.infer<typeof UpdateSiteBody>;

export const SiteMembersBody = z.object({ userIds: z.array(Id).max(1000) });

export const SiteListQuery = listQuery(
  { name: 'name', country: 'country', regime: 'regime', createdAt: 'created_at', updatedAt: 'updated_at' },
  'name',
);

export const SiteDto = z.object({
  id: Id,
  name: z.string(),
  timeZone: z.string(),
  country: z.string(),
  regime: z.enum(REGIMES),
  address: z.string().nullable(),
  archivedAt: z.string().nullable(),
  version: z.number().int(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type SiteDto = z.infer<typeof SiteDto>;

export const SiteMemberDto = z.object({
  userId: Id,
  name: z.string(),
  email: z.string(),
  role: z.string(),
});
export type SiteMemberDto = z.infer<typeof SiteMemberDto>;


export const SiteCountsDto = z.object({
  units: z.number().int(),
  stacks: z.number().int(),
  channels: z.number().int(),
  fuels: z.number().int(),
  permits: z.number().int(),
});

/** The site page: the site with its live units, stacks (with channels) and fuels, and counts. */
export const SiteDetailDto = SiteDto.extend({
  units: z.array(EmissionUnitDto),
  stacks: z.array(StackWithChannelsDto),
  fuels: z.array(FuelDto),
  counts: SiteCountsDto,
});
export type SiteDetailDto = z.infer<typeof SiteDetailDto>;
