import { ComponentFixture, TestBed } from '@angular/core/testing';

import type { ReviewLimit } from '../../../core/api/review-api';
import { noxLimit } from '../testing/review-fixtures';
import { LimitVerdicts } from './limit-verdicts';

/** A US limit per heat input on a 30-operating-day rolling average, part-way through its period (invented figures). */
function usLimit(): ReviewLimit {
  return {
    limit: {
      ...noxLimit,
      id: 'lim-nox-30d',
      elv: 0.2,
      unit: 'lb/MMBtu',
      referenceO2Percent: null,
      period: 'rolling_days',
      periodLength: 30,
      summary: 'NOx ≤ 0.2 lb/MMBtu, per heat input (F-factor), 30 operating-day rolling average',
    },
    channelId: 'ch-nox',
    verdict: 'exceedance',
    note: 'One 30-day average above the ELV.',
    threshold: 0.2,
    availabilityPercent: 99.2,
    validHours: 700,
    invalidHours: 6,
    invalidDays: 0,
    exceedances: [{ start: '2026-10-20T06:00:00.000Z', end: '2026-10-21T06:00:00.000Z', peak: 0.2134, peakAt: '2026-10-20T06:00:00.000Z', percentOfElv: 106.7, threshold: 0.2, periodCount: 1 }],
    nearMisses: [],
    share: null,
    headroom: {
      asOf: '2026-10-25T06:00:00.000Z',
      periodStart: '2026-10-01T06:00:00.000Z',
      periodEnd: '2026-10-31T06:00:00.000Z',
      remainingHours: 144,
      averageSoFar: 0.1712,
      maxAverageToStayCompliant: 0.1534,
      exceedanceCertain: false,
      periodsAboveAllowedRemaining: null,
      note: null,
    },
  };
}

describe('LimitVerdicts', () => {
  let fixture: ComponentFixture<LimitVerdicts>;

  async function render(limits: ReviewLimit[]): Promise<string> {
    fixture = TestBed.createComponent(LimitVerdicts);
    fixture.componentRef.setInput('limits', limits);
    fixture.componentRef.setInput('timeZone', 'America/Denver');
    await fixture.whenStable();
    return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
  }

  it('states headroom and peaks of a lb/MMBtu limit to three decimals, not rounded onto the ELV', async () => {
    const page = await render([usLimit()]);
    // With one decimal both 0.1534 and 0.2134 would read "0.2", the ELV itself.
    expect(page).toContain('Average ≤ 0.153 lb/MMBtu over the remaining 144 h');
    expect(page).toContain('peak 0.213 lb/MMBtu (107 % of the ELV)');
    expect(page).toContain('NOx ≤ 0.2 lb/MMBtu');
  });
});
