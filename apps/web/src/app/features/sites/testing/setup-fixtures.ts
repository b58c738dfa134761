import { signal } from '@angular/core';
import { ComponentFixture } from '@angular/core/testing';

import { Role } from '../../../core/api/auth-api';
import { Fuel } from '../../../core/api/fuels-api';
import { SiteDetail } from '../../../core/api/sites-api';
import { Auth } from '../../../core/auth/auth';
import { meAs } from '../../../testing/me-fixtures';

/*
 * Invented set-up records for web tests: the Harbourside paper mill of the invented Northmoor
 * Energy (ids are fixed strings, not real uuids, which the screens never parse).
 */

/** The signed-in person, as the set-up screens read it (`auth.me()`). */
export function authAs(role: Role) {
  const me = signal(meAs(role));
  return { provide: Auth, useValue: { me: me.asReadonly(), can: (p: string) => me().permissions.includes(p) } };
}

const stamp = { archivedAt: null, version: 1, createdAt: '2026-11-02T08:00:00Z', updatedAt: '2026-11-02T08:00:00Z' };

export const gasFuel: Fuel = {
  ...stamp,
  id: 'fuel-gas',
  siteId: 'site-1',
  name: 'Pipeline gas',
  fuelType: 'natural_gas',
  kind: 'gas',
  currentAnalysis: {
    id: 'analysis-1',
    fuelId: 'fuel-gas',
    validFrom: '2026-01-01',
    ultimate: null,
    composition: { CH4: 100 },
    gcvMJPerKg: null,
    gcvMJPerNm3: 39.74,
    gcvSource: 'correlation',
    fdDscfPerMMBtu: 8632,
    fwWscfPerMMBtu: 10665,
    fcScfPerMMBtu: 1007,
    fFactorSource: 'computed',
    createdBy: null,
    createdAt: '2026-11-02T08:00:00Z',
  },
};

export function siteDetail(overrides: Partial<SiteDetail> = {}): SiteDetail {
  return {
    ...stamp,
    id: 'site-1',
    name: 'Harbourside Mill',
    timeZone: 'Europe/Berlin',
    country: 'DE',
    regime: 'eu_ied',
    address: null,
    units: [
      {
        ...stamp,
        id: 'unit-1',
        siteId: 'site-1',
        name: 'Boiler 2',
        unitType: 'boiler',
        ratedThermalInputMWth: 48,
        inServiceFrom: '2015-04-01',
        inServiceTo: null,
        fuelIds: ['fuel-gas'],
      },
    ],
    stacks: [
      {
        ...stamp,
        id: 'stack-1',
        siteId: 'site-1',
        name: 'Main stack',
        heightM: 60,
        diameterM: 2.4,
        unitIds: ['unit-1'],
        channels: [
          {
            ...stamp,
            id: 'channel-o2',
            stackId: 'stack-1',
            parameter: 'O2',
            unit: '%',
            basis: 'dry',
            conditions: 'standard',
            rangeMin: 0,
            rangeMax: 25,
            intervalMinutes: 1,
            sourceLabel: 'O2_DRY',
          },
        ],
      },
    ],
    fuels: [gasFuel],
    counts: { units: 1, stacks: 1, channels: 1, fuels: 1, permits: 0 },
    ...overrides,
  };
}

/** Lets pending promises, timers and change detection run. */
export async function settle(fixture: ComponentFixture<unknown>, ms = 0): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, ms));
  await fixture.whenStable();
}
