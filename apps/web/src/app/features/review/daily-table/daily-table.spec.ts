import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatIconHarness } from '@angular/material/icon/testing';
import { MatTableHarness } from '@angular/material/table/testing';

import type { Review } from '../../../core/api/review-api';
import { dailyAcrossDstFixture, emptyDailyFixture, noxLimit, reviewFixture } from '../testing/review-fixtures';
import { DailyTable, dayLabel } from './daily-table';

/** The review of late October 2026 in Berlin, the NOx daily limit with or without its confidence interval. */
function octoberReview(confidenceIntervalPercent: number | null): Review {
  const base = reviewFixture();
  const ciMgPerNm3 = ((confidenceIntervalPercent ?? 0) / 100) * noxLimit.elv;
  return reviewFixture({
    from: '2026-10-23T22:00:00.000Z',
    to: '2026-10-29T23:00:00.000Z',
    daily: dailyAcrossDstFixture(ciMgPerNm3),
    limits: [{ ...base.limits[0], limit: { ...noxLimit, confidenceIntervalPercent } }],
  });
}

describe('DailyTable', () => {
  let fixture: ComponentFixture<DailyTable>;
  let loader: HarnessLoader;

  async function render(review: Review, limitId = 'lim-nox-day'): Promise<MatTableHarness> {
    fixture = TestBed.createComponent(DailyTable);
    fixture.componentRef.setInput('review', review);
    fixture.componentRef.setInput('limitId', limitId);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    return loader.getHarness(MatTableHarness);
  }

  function text(): string {
    return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
  }

  describe('the local day labels', () => {
    it('name the day of the site calendar, not of UTC', () => {
      // 23:00 UTC on 1 November is midnight starting Monday 2 November in Berlin (CET, UTC+1).
      expect(dayLabel('2026-11-01T23:00:00.000Z', 'Europe/Berlin')).toBe('Mon 2 Nov 2026');
      expect(dayLabel('2026-11-01T23:00:00.000Z', 'UTC')).toBe('Sun 1 Nov 2026');
    });
  });

  describe('for a limit with a confidence interval', () => {
    it('lists one row per local day, the 25-hour day at the end of summer time included', async () => {
      const table = await render(octoberReview(20));
      const cells = await table.getCellTextByColumnName();
      // Summer time ends on the last Sunday of October, 25 October 2026 (Directive 2000/84/EC art. 2 [memory]):
      // that day runs from 22:00 UTC on the 24th (CEST) to 23:00 UTC on the 25th (CET).
      expect(cells['day'].text).toEqual([
        'Sat 24 Oct 2026',
        'Sun 25 Oct 2026 (25-hour day)',
        'Mon 26 Oct 2026',
        'Tue 27 Oct 2026',
        'Wed 28 Oct 2026',
        'Thu 29 Oct 2026',
      ]);
      expect(cells['validHours'].text).toEqual(['24', '25', '24', '—', '0', '12']);
      expect(cells['invalidHours'].text).toEqual(['0', '0', '0', '—', '0', '12']);
      expect(cells['status'].text).toEqual(['Valid', 'Valid', 'Valid', '—', 'Not operating', 'Not valid']);
    });

    it('shows the validated average beside the measured one, less 20 % of the ELV', async () => {
      const table = await render(octoberReview(20));
      const headers = await (await table.getHeaderRows())[0].getCellTextByColumnName();
      expect(headers['measured']).toBe('Measured (mg/Nm3, 3 % O2)');
      expect(headers['validated']).toBe('Validated (mg/Nm3, 3 % O2)');
      const cells = await table.getCellTextByColumnName();
      // NOx: confidence interval 20 % of the ELV, 100 → 20 mg/Nm3 (IED 2010/75/EU Annex V Part 3, REFERENCES.md §5).
      expect(cells['measured'].text).toEqual(['95.3', '134.8', '125.0', '—', '—', '88.0']);
      expect(cells['validated'].text).toEqual(['75.3', '114.8', '105.0', '—', '—', '68.0']);
      expect(text()).toContain('less the confidence interval of 20 % of the ELV (20.0 mg/Nm3)');
    });

    it('marks a day above 110 % of the ELV on its validated average, with an icon and words', async () => {
      const table = await render(octoberReview(20));
      const headers = await (await table.getHeaderRows())[0].getCellTextByColumnName();
      expect(headers['check']).toBe('Against 110 mg/Nm3');
      const rows = await table.getRows();
      // No validated daily average may exceed 110 % of the ELV (IED 2010/75/EU Annex V Part 4, REFERENCES.md §5):
      // 114.8 is above; 125.0 measured is 105.0 validated, which is not.
      const sunday = (await rows[1].getCells({ columnName: 'check' }))[0];
      expect(await sunday.getText()).toContain('Above 110 % of the ELV');
      expect(await (await sunday.getHarness(MatIconHarness)).getName()).toBe('warning');
      const checks = await Promise.all(rows.map(async (row) => (await row.getCells({ columnName: 'check' }))[0].getText()));
      expect(checks.map((check) => check.replace('warning', ''))).toEqual(['Within', 'Above 110 % of the ELV', 'Within', '—', '—', 'Not judged']);
      expect(await (await rows[0].getCells({ columnName: 'check' }))[0].getHarnessOrNull(MatIconHarness)).toBeNull();
    });

    it('says what the figures are and that they support, not replace, the regulatory reporting', async () => {
      await render(octoberReview(20));
      const page = text();
      expect(page).toContain('For NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average.');
      expect(page).toContain('A day is marked when it is above 110 mg/Nm3 (110 % of the ELV of 100 mg/Nm3).');
      expect(page).toContain('support, not replace, your regulatory reporting');
      expect(page).not.toContain('not day by day');
    });
  });

  describe('for a limit without a confidence interval', () => {
    it('has no validated column and judges the measured average', async () => {
      const table = await render(octoberReview(null));
      const headers = await (await table.getHeaderRows())[0].getCellTextByColumnName();
      expect(Object.keys(headers)).toEqual(['day', 'measured', 'status', 'validHours', 'invalidHours', 'check']);
      const cells = await table.getCellTextByColumnName();
      // 125.0 is above 110 when no interval is subtracted.
      expect(cells['check'].text.map((check) => check.replace('warning', ''))).toEqual(['Within', 'Above 110 % of the ELV', 'Above 110 % of the ELV', '—', '—', 'Not judged']);
      expect(text()).toContain('this limit subtracts no confidence interval');
    });
  });

  describe('for a monthly limit judged at the ELV itself', () => {
    it('marks days above the ELV and says the limit is not judged day by day', async () => {
      const base = octoberReview(20);
      const monthly = { ...noxLimit, id: 'lim-nox-month', period: 'month' as const, criterion: { type: 'every_period' as const, factor: 1 }, summary: 'NOx ≤ 100 mg/Nm3, dry, 3 % O2, monthly average' };
      const table = await render(
        {
          ...base,
          daily: { ...base.daily, limits: { 'lim-nox-month': base.daily.limits['lim-nox-day']! } },
          limits: [{ ...base.limits[0]!, limit: monthly, threshold: 100 }],
        },
        'lim-nox-month',
      );
      const cells = await table.getCellTextByColumnName();
      // Validated 75.3, 114.8, 105.0 against 100.
      expect(cells['check'].text.map((check) => check.replace('warning', '')).slice(0, 3)).toEqual(['Within', 'Above the ELV', 'Above the ELV']);
      expect(text()).toContain('A day is marked when it is above 100 mg/Nm3, the ELV.');
      expect(text()).toContain('not day by day');
    });
  });

  it('reads the days of November in the site calendar from the review fixture', async () => {
    const table = await render(reviewFixture());
    const cells = await table.getCellTextByColumnName();
    expect(cells['day'].text).toEqual(['Sun 1 Nov 2026', 'Mon 2 Nov 2026']);
  });

  it('marks the 23-hour day when summer time starts', async () => {
    const base = reviewFixture();
    // Summer time starts on the last Sunday of March, 29 March 2026, at 01:00 UTC (Directive 2000/84/EC art. 1 [memory]).
    const table = await render({
      ...base,
      daily: {
        ...base.daily,
        dayStart: ['2026-03-28T23:00:00.000Z'],
        dayEnd: ['2026-03-29T22:00:00.000Z'],
        limits: { 'lim-nox-day': { value: [80], validatedValue: [60], status: [0], validHours: [23], invalidHours: [0] } },
      },
    });
    const cells = await table.getCellTextByColumnName();
    expect(cells['day'].text).toEqual(['Sun 29 Mar 2026 (23-hour day)']);
  });

  describe('the empty state', () => {
    it('shows when the limit has no daily columns', async () => {
      const table = await render(reviewFixture({ daily: emptyDailyFixture }));
      expect(await table.getRows()).toHaveLength(0);
      expect(text()).toContain('No daily values for this limit in this period.');
    });

    it('shows when every day of the limit is empty', async () => {
      const base = reviewFixture();
      const empty = { value: [null, null], validatedValue: [null, null], status: [null, null], validHours: [null, null], invalidHours: [null, null] };
      const table = await render({ ...base, daily: { ...base.daily, limits: { 'lim-nox-day': empty } } });
      expect(await table.getRows()).toHaveLength(0);
      expect(text()).toContain('No daily values for this limit in this period.');
    });

    it('is not shown when days hold values', async () => {
      const table = await render(reviewFixture());
      expect(await table.getRows()).toHaveLength(2);
      expect(text()).not.toContain('No daily values');
    });
  });

  it('names the table after the limit and points to the note for screen readers', async () => {
    await render(octoberReview(20));
    const table = (fixture.nativeElement as HTMLElement).querySelector('table')!;
    expect(table.getAttribute('aria-label')).toBe('Daily averages of NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average');
    const note = (fixture.nativeElement as HTMLElement).querySelector(`#${table.getAttribute('aria-describedby')}`);
    expect(note?.textContent).toContain('Validated: the measured average less the confidence interval');
  });
});
