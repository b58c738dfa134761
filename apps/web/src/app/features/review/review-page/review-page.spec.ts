// The date adapter ships as an ES module jest does not transform; the chart's axis is not under test here.
jest.mock('chartjs-adapter-date-fns', () => ({}));

import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import { provideCharts, withDefaultRegisterables } from 'ng2-charts';

import { Me, Role } from '../../../core/api/auth-api';
import { RawReading, Review } from '../../../core/api/review-api';
import { Auth } from '../../../core/auth/auth';
import { meAs } from '../../../testing/me-fixtures';
import { coChannel } from '../../imports/testing/import-fixtures';
import { emptyDailyFixture, emptyHourlyFixture, noxLimit, readingsFixture, reviewFixture, site, stack, toWire } from '../testing/review-fixtures';
import { ReviewPage } from './review-page';

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

function text(fixture: ComponentFixture<unknown>): string {
  return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
}

const reading = (id: string, t: string, value: number): RawReading => ({
  id, t, value, status: 'valid', current: true, importId: 'imp-1', createdBy: 'user-officer', createdByName: 'Priya Okafor', createdAt: '2026-12-01T08:04:00Z',
  supersededAt: null, supersededBy: null, reason: null,
});
const readings = readingsFixture([reading('1', '2026-10-31T23:01:00Z', 58.2), reading('2', '2026-10-31T23:02:00Z', 61.9)]);

describe('ReviewPage', () => {
  let fixture: ComponentFixture<ReviewPage>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeAll(() => {
    // jsdom has no canvas: Chart.js gets no context and draws nothing, which is fine here.
    jest.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue(null);
    jest.spyOn(console, 'error').mockImplementation((...args: unknown[]) => {
      if (String(args[0]).includes('Failed to create chart')) return;
      throw new Error(args.map(String).join(' '));
    });
  });
  afterAll(() => jest.restoreAllMocks());

  async function open(role: Role, month: string | undefined): Promise<void> {
    const me: Me = meAs(role);
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideCharts(withDefaultRegisterables()),
        { provide: Auth, useValue: { me: signal(me), can: (permission: string) => me.permissions.includes(permission) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ReviewPage);
    fixture.componentRef.setInput('stackId', 'stack-b2');
    if (month) fixture.componentRef.setInput('month', month);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);

    http.expectOne('/api/stacks/stack-b2').flush(stack);
    await settle(fixture);
    http.match('/api/sites/site-1').forEach((request) => request.flush({ ...site, units: [], stacks: [stack], fuels: [], counts: {} }));
    http.match((request) => request.url === '/api/sites').forEach((request) => request.flush({ items: [site], total: 1 }));
    await settle(fixture);
    http.match('/api/sites/site-1').forEach((request) => request.flush({ ...site, units: [], stacks: [stack], fuels: [], counts: {} }));
    await settle(fixture);
  }

  /** The review request; `flush` answers it as the API would send the review given. */
  function reviewRequest(): { request: TestRequest['request']; flush(review: Review): void } {
    const pending = http.expectOne((request) => request.url === '/api/stacks/stack-b2/review');
    return { request: pending.request, flush: (review) => pending.flush(toWire(review)) };
  }

  afterEach(() => http.verify());

  it('asks for the month of the site calendar and shows each limit with its verdict and availability', async () => {
    await open('officer', '2026-11');
    const request = reviewRequest();
    // November in Europe/Berlin (UTC+1) starts at 23:00 UTC on 31 October.
    expect(request.request.params.get('from')).toBe('2026-10-31T23:00:00.000Z');
    expect(request.request.params.get('to')).toBe('2026-11-30T23:00:00.000Z');
    request.flush(reviewFixture());
    await settle(fixture);

    const page = text(fixture);
    expect(page).toContain('Exceedance');
    expect(page).toContain('NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average');
    expect(page).toMatch(/Data availability\s*97\.9 %/);
    expect(page).toContain('peak 121.5 mg/Nm3 (122 % of the ELV)');
    expect(page).toContain('measured 9.1 % CO2, expected 10.6 %');
    expect(page).toContain('support, and do not replace');

    const hourly = await loader.getHarness(MatTableHarness.with({ selector: '[aria-label="Hourly values"]' }));
    const cells = await hourly.getCellTextByColumnName();
    expect(cells['hour'].text[0]).toMatch(/1 Nov 2026, 00:00/);
    expect(cells['status'].text[5]).toBe('Not valid');
    expect(cells['coverage'].text[5]).toBe('20 %');
    // mg/Nm3 with one decimal, always: a column of figures lines up (NOx 60 + i, corrected 61 + i).
    expect(cells['value'].text.slice(0, 2)).toEqual(['60.0', '61.0']);
    expect(cells['limit-lim-nox-day'].text[0]).toBe('61.0');
  });

  it('opens the chart and the table on NOx, not on the limit the API happens to list first', async () => {
    await open('officer', '2026-11');
    const base = reviewFixture();
    const coLimit = { ...noxLimit, id: 'lim-co-day', pollutant: 'CO' as const, summary: 'CO ≤ 100 mg/Nm3, dry, 3 % O2, daily average' };
    reviewRequest().flush(
      reviewFixture({
        channels: [...base.channels, { id: coChannel.id, parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', intervalMinutes: 1 }],
        limits: [{ ...base.limits[0], limit: coLimit, channelId: coChannel.id, verdict: 'compliant', exceedances: [], nearMisses: [] }, base.limits[0]],
      }),
    );
    await settle(fixture);

    const channel = await loader.getHarness(MatSelectHarness.with({ selector: '.chart-controls mat-select' }));
    expect(await channel.getValueText()).toBe('NOx (as NO2) · mg/Nm3, dry');
    // The verdicts read in the same order: NOx before CO.
    const verdicts = Array.from((fixture.nativeElement as HTMLElement).querySelectorAll('[aria-label="Verdicts per limit"] .pollutant')).map((el) => el.textContent?.trim());
    expect(verdicts).toEqual(['NOx ≤ 100 mg/Nm3', 'CO ≤ 100 mg/Nm3']);
  });

  it('shows one corrected column for NOx limits whose corrected hours are the same figures', async () => {
    await open('officer', '2026-11');
    const base = reviewFixture();
    const monthly = { ...noxLimit, id: 'lim-nox-month', period: 'month' as const, summary: 'NOx ≤ 100 mg/Nm3, dry, 3 % O2, monthly average' };
    reviewRequest().flush(
      reviewFixture({
        hourly: { ...base.hourly, limits: { ...base.hourly.limits, 'lim-nox-month': base.hourly.limits['lim-nox-day'] } },
        limits: [...base.limits, { ...base.limits[0], limit: monthly, verdict: 'compliant', exceedances: [], nearMisses: [] }],
      }),
    );
    await settle(fixture);

    const hourly = await loader.getHarness(MatTableHarness.with({ selector: '[aria-label="Hourly values"]' }));
    const headers = await (await hourly.getHeaderRows())[0].getCellTextByColumnName();
    expect(Object.keys(headers).filter((column) => column.startsWith('limit-'))).toEqual(['limit-lim-nox-day']);
    expect(headers['limit-lim-nox-day']).toBe('Corrected (mg/Nm3, 3 % O2)');
  });

  function flushEmptyMonth(): void {
    reviewRequest().flush(
      reviewFixture({
        from: '2026-11-30T23:00:00.000Z',
        to: '2026-12-31T23:00:00.000Z',
        hourly: emptyHourlyFixture('2026-11-30T23:00:00.000Z', 744),
        daily: emptyDailyFixture,
        limits: reviewFixture().limits.map((entry) => ({ ...entry, verdict: 'insufficient_data' as const, exceedances: [], nearMisses: [] })),
      }),
    );
  }

  it('tells the officer to import when the month holds no readings, instead of an empty chart and table', async () => {
    await open('officer', '2026-12');
    flushEmptyMonth();
    await settle(fixture);

    expect(text(fixture)).toContain('No readings are stored for this stack in December 2026.');
    const importLink = (fixture.nativeElement as HTMLElement).querySelector<HTMLAnchorElement>('.no-data a');
    expect(importLink?.textContent).toContain("Import this stack's data");
    expect(importLink?.getAttribute('href')).toBe('/imports/stacks/stack-b2');
    expect(await loader.getAllHarnesses(MatTableHarness.with({ selector: '[aria-label="Hourly values"]' }))).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).querySelector('canvas')).toBeNull();
    // The limits that apply stay in view.
    expect(text(fixture)).toContain('Not enough valid data');
  });

  it('tells the auditor who brings the data in, with no import link', async () => {
    await open('auditor', '2026-12');
    flushEmptyMonth();
    await settle(fixture);

    expect(text(fixture)).toContain('once an environmental officer imports');
    expect((fixture.nativeElement as HTMLElement).querySelector('.no-data a')).toBeNull();
  });

  it('lets the API pick the latest month with data when the URL names none, and shows that month', async () => {
    await open('officer', undefined);
    const request = reviewRequest();
    expect(request.request.params.keys()).toEqual([]);
    request.flush(reviewFixture());
    await settle(fixture);

    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[type="month"]' }))).getValue()).toBe('2026-11');
    expect(text(fixture)).toContain('November 2026');

    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Previous month"]' }))).click();
    const previous = reviewRequest();
    // October in Europe/Berlin: summer time until the 25th, so it starts at 22:00 UTC.
    expect(previous.request.params.get('from')).toBe('2026-09-30T22:00:00.000Z');
    expect(previous.request.params.get('to')).toBe('2026-10-31T23:00:00.000Z');
    previous.flush(
      reviewFixture({
        from: '2026-09-30T22:00:00.000Z',
        to: '2026-10-31T23:00:00.000Z',
        hourly: emptyHourlyFixture('2026-09-30T22:00:00.000Z', 745),
        daily: emptyDailyFixture,
      }),
    );
    await settle(fixture);
    expect(text(fixture)).toContain('No readings are stored for this stack in October 2026.');
  });

  async function drillIntoFirstHour(): Promise<void> {
    reviewRequest().flush(reviewFixture());
    await settle(fixture);
    const buttons = await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Readings' }));
    await buttons[0].click();
    const request = http.expectOne((r) => r.url === '/api/channels/ch-nox/readings');
    expect(request.request.params.get('from')).toBe('2026-10-31T23:00:00.000Z');
    expect(request.request.params.get('to')).toBe('2026-11-01T00:00:00.000Z');
    expect(request.request.params.get('includeSuperseded')).toBe('true');
    request.flush(readings);
    await settle(fixture);
  }

  it('lets the auditor read the raw readings and their import, with no correction controls', async () => {
    await open('auditor', '2026-11');
    await drillIntoFirstHour();

    const raw = await loader.getHarness(MatTableHarness.with({ selector: '[aria-label="Raw readings of the hour"]' }));
    const cells = await raw.getCellTextByColumnName();
    expect(cells['value'].text).toEqual(['58.2', '61.9']);
    // The source, then who wrote the reading into the record and when (the import's committer).
    expect(cells['import'].text[0]).toMatch(/^boiler2-2026-11\.xlsx\s*by Priya Okafor, 1 Dec 2026/);

    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Apply correction' }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatRadioGroupHarness)).toHaveLength(0);
    expect(text(fixture)).not.toContain('Reason for the correction');
  });

  it('lets the officer substitute a value for the hour, with a reason', async () => {
    await open('officer', '2026-11');
    await drillIntoFirstHour();

    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Substitute a value' });
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formcontrolname="value"]' }))).setValue('64,5');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Apply correction' }))).click();
    // No reason: nothing is sent.
    http.expectNone('/api/channels/ch-nox/corrections');

    await (await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }))).setValue('Analyser calibration drift, value from the parallel monitor');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Apply correction' }))).click();
    const correction = http.expectOne({ method: 'POST', url: '/api/channels/ch-nox/corrections' });
    expect(correction.request.body).toEqual({
      from: '2026-10-31T23:00:00.000Z',
      to: '2026-11-01T00:00:00.000Z',
      action: 'substitute',
      valuePerReading: 64.5,
      reason: 'Analyser calibration drift, value from the parallel monitor',
    });
    correction.flush({ superseded: 60 });
    await settle(fixture);
    // The readings and the month are fetched again, now with the correction.
    http.expectOne((r) => r.url === '/api/channels/ch-nox/readings').flush(readings);
    reviewRequest().flush(reviewFixture());
    await settle(fixture);
  });
});
