/**
 * Browser end-to-end of the monthly import (issue 6): the officer uploads the example workbook,
 * confirms the suggested column mapping, sees the preview with its problems, commits with a
 * progress bar, sees the month's chart and the verdict of every limit in the data review; the
 * next import of the same file reports "Nothing new". No console error (CSP violations included)
 * and no request leaves loopback.
 *
 * The demo seed already imports the example month into the demo Boiler 2 stack, so the test first
 * sets up a fresh stack on the demo site through the API (the officer's own signed-in session,
 * with the CSRF header): the demo stack's seven monitored channels with the logger's column names,
 * and the permit's IED limits for it. The example month's CO2 analyser drifts on 16–19 October,
 * which the review's O2/CO2 plausibility check must flag. The stack's name carries the run's timestamp so reruns
 * against the same database pass.
 */
import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';

import { baseUrl, launch, signIn, type BrowserSession, type WatchedPage } from './browser';

const runId = new Date().toISOString().replace(/\D/g, '').slice(0, 14);
const siteName = 'Northmoor Mill';
const permitReference = 'NM-IED-2024-017';
const stackName = `Boiler 2 test stack ${runId}`;
const exampleFile = join(__dirname, '..', '..', 'examples', 'northmoor-boiler2-2026-10.xlsx');
const fileName = 'northmoor-boiler2-2026-10.xlsx';

/**
 * The channels of the demo Boiler 2 stack (seeds/02_demo_setup.ts), named as the logger writes
 * its columns. The example file also has K2_SO2 and K2_LOAD, which this stack does not monitor.
 */
const channels = [
  { parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 400, sourceLabel: 'K2_NOX' },
  { parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 300, sourceLabel: 'K2_CO' },
  { parameter: 'O2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 25, sourceLabel: 'K2_O2' },
  { parameter: 'CO2', unit: '%', basis: 'dry', conditions: 'standard', rangeMin: 0, rangeMax: 20, sourceLabel: 'K2_CO2' },
  { parameter: 'H2O', unit: '%', basis: 'wet', conditions: 'standard', rangeMin: 0, rangeMax: 40, sourceLabel: 'K2_H2O' },
  { parameter: 'flow', unit: 'Nm3/h', basis: 'wet', conditions: 'standard', rangeMin: 0, rangeMax: 120000, sourceLabel: 'K2_FLOW' },
  { parameter: 'temperature', unit: 'degC', basis: 'wet', conditions: 'actual', rangeMin: 0, rangeMax: 400, sourceLabel: 'K2_TEMP' },
] as const;
const mappedHeaders = channels.map((c) => c.sourceLabel);
const unmappedHeaders = ['K2_SO2', 'K2_LOAD'];

/**
 * The IED Annex V limits of a gas-fired boiler's NOx at 100 mg/Nm3, 3 % O2 dry (IED 2010/75/EU
 * Annex V Part 1 for the reference O2 and Part 4 point 1 for the criteria [pub]; REFERENCES.md
 * §4–5): the validated monthly average ≤ ELV and every validated daily average ≤ 110 % of it;
 * a validated value has the 95 % confidence interval of Part 3 (20 % of the ELV for NOx)
 * subtracted, and a day with more than three invalid hours is not valid (Part 4 point 3).
 */
const limits = [
  { pollutant: 'NOx', elv: 100, period: 'month', criterion: { type: 'every_period', factor: 1 } },
  { pollutant: 'NOx', elv: 100, period: 'day', criterion: { type: 'every_period', factor: 1.1 } },
].map((l) => ({
  ...l,
  unit: 'mg/Nm3',
  referenceO2Percent: 3,
  ambientO2Percent: 21,
  basis: 'dry',
  confidenceIntervalPercent: 20,
  minData: { maxInvalidHoursPerDay: 3 },
}));

let session: BrowserSession;
let officer: WatchedPage;
let stackId = '';
/** Readings the first import stored. */
let stored = 0;

beforeAll(async () => {
  session = await launch();
  officer = await session.newPage();
  officer.page.setDefaultTimeout(30_000);
});
afterAll(async () => {
  await session?.close();
});

function expectClean(w: WatchedPage): void {
  expect(w.consoleErrors).toEqual([]);
  expect(w.externalRequests).toEqual([]);
}

/** A JSON call of the API in the page's signed-in session, with the CSRF header on writes. */
async function api<T>(page: Page, method: 'GET' | 'POST', path: string, body?: unknown): Promise<T> {
  const cookies = await page.context().cookies(baseUrl());
  const csrf = cookies.find((c) => c.name === 'XSRF-TOKEN')?.value;
  if (method !== 'GET' && !csrf) throw new Error('no XSRF-TOKEN cookie: is the officer signed in?');
  const res = await page.context().request.fetch(`${baseUrl()}${path}`, {
    method,
    headers: method === 'GET' ? {} : { 'X-XSRF-TOKEN': csrf as string },
    ...(body === undefined ? {} : { data: body }),
  });
  if (!res.ok()) throw new Error(`${method} ${path} → ${res.status()}: ${await res.text()}`);
  return (await res.json()) as T;
}

interface Named {
  id: string;
  name?: string;
  reference?: string;
}

/** Opens a Material select from the keyboard and picks one option by its visible text. */
async function choose(page: Page, label: string, option: string): Promise<void> {
  await page.getByRole('combobox', { name: label, exact: true }).focus();
  await page.keyboard.press('Enter');
  await page.getByRole('listbox').waitFor();
  await page.getByRole('option', { name: option, exact: true }).click();
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

/** "268,195" → 268195 */
const numberIn = (text: string): number => Number.parseFloat(text.replace(/,/g, '').replace(/^[^\d-]*/, ''));

/** The figure of the import summary under this label (each label sits on its own line above its value). */
async function figure(summary: Locator, label: string): Promise<number> {
  const lines = (await summary.innerText()).split('\n').map((line) => line.trim()).filter(Boolean);
  const at = lines.indexOf(label);
  if (at < 0 || at + 1 >= lines.length) throw new Error(`the import summary has no figure "${label}": ${lines.join(' | ')}`);
  return numberIn(lines[at + 1]);
}

/** Uploads the example file and confirms the suggested mapping; leaves the page on the preview. */
async function uploadAndConfirm(page: Page, { firstTime }: { firstTime: boolean }): Promise<void> {
  await page.getByLabel('Data logger file').setInputFiles(exampleFile);
  await page.getByRole('button', { name: 'Upload', exact: true }).click();
  // The file is a few MB: the upload's own bar may pass quickly, the server's reading takes longer.
  await page.getByRole('progressbar', { name: /^(Upload progress|Reading the file on the server)$/ }).first().waitFor();

  await page.getByRole('button', { name: 'Confirm mapping' }).waitFor({ timeout: 60_000 });
  const main = page.getByRole('main');
  await main.getByText(fileName, { exact: true }).first().waitFor();
  if (!firstTime) await main.getByText('This file was already imported on', { exact: false }).waitFor();

  // Suggested from the channels' logger labels (first time) or the remembered mapping (second).
  // The logger writes the unit beside the name: "K2_NOX [mg/Nm3]".
  const channelFor = (header: string) => page.getByRole('combobox', { name: new RegExp(`^Channel for column [A-Z]+ \\(${header} \\[[^\\]]+\\]\\)$`) });
  for (const header of mappedHeaders) expect(await channelFor(header).innerText()).not.toMatch(/Do not import/);
  expect(await channelFor('K2_NOX').innerText()).toBe('NOx (as NO2) · mg/Nm3, dry');
  expect(await channelFor('K2_O2').innerText()).toBe('O2 · %, dry');
  expect(await channelFor('K2_CO2').innerText()).toBe('CO2 · %, dry');
  for (const header of unmappedHeaders) expect(await channelFor(header).innerText()).toBe('Do not import');
  expect(await page.getByRole('combobox', { name: 'Timestamp column', exact: true }).innerText()).toMatch(/^A · \S/);
  expect(await page.getByRole('combobox', { name: 'Timestamps mark', exact: true }).innerText()).toBe('The end of each interval');
  // The logger's status column is found and read (calibration and fault minutes).
  expect(await page.getByRole('combobox', { name: 'Status column', exact: true }).innerText()).toMatch(/^[A-Z]+ · \S/);

  const remember = page.getByRole('checkbox', { name: 'Remember this mapping for the stack' });
  if (!(await remember.isChecked())) await remember.check();
  await page.getByRole('button', { name: 'Confirm mapping' }).click();
  await page.getByRole('region', { name: 'Import summary' }).waitFor({ timeout: 60_000 });
}

describe('importing a month of stack data', () => {
  it('sets up a fresh stack with the logger’s channels and the permit’s NOx limits', async () => {
    const { page } = officer;
    await signIn(page, 'officer@northmoor.example');
    await page.waitForURL(`${baseUrl()}/overview`);

    const sites = await api<{ items: Named[] }>(page, 'GET', `/api/sites?q=${encodeURIComponent(siteName)}`);
    const site = sites.items.find((s) => s.name === siteName);
    if (!site) throw new Error(`the demo site ${siteName} is missing: seed the database first`);
    const units = await api<{ items: Named[] }>(page, 'GET', `/api/sites/${site.id}/units?q=Boiler%202`);
    const boiler2 = units.items.find((u) => u.name === 'Boiler 2');
    const permits = await api<{ items: Named[] }>(page, 'GET', `/api/sites/${site.id}/permits`);
    const permit = permits.items.find((p) => p.reference === permitReference);
    if (!boiler2 || !permit) throw new Error('the demo Boiler 2 or its permit is missing: seed the database first');

    const stack = await api<Named>(page, 'POST', `/api/sites/${site.id}/stacks`, { name: stackName, heightM: 55, diameterM: 2.2, unitIds: [boiler2.id] });
    stackId = stack.id;
    for (const channel of channels) await api(page, 'POST', `/api/stacks/${stackId}/channels`, { ...channel, intervalMinutes: 1 });
    for (const limit of limits) await api(page, 'POST', `/api/permits/${permit.id}/limits`, { ...limit, stackId });
    expectClean(officer);
  });

  it('uploads the example file, confirms the suggested mapping and sees the preview with its problems', async () => {
    const { page } = officer;
    if (!stackId) throw new Error('the set-up step did not create the stack');
    await page.getByRole('navigation').getByRole('link', { name: 'Import', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Import monitoring data' }).waitFor();
    await choose(page, 'Site', siteName);
    await choose(page, 'Stack', stackName);
    await page.waitForURL(`${baseUrl()}/imports/stacks/${stackId}`);
    await page.getByRole('heading', { level: 2, name: new RegExp(`^${stackName}`) }).waitFor();

    await uploadAndConfirm(page, { firstTime: true });

    const summary = page.getByRole('region', { name: 'Import summary' });
    // October 2026 has 31 days plus the repeated hour at the end of summer time (25 October,
    // Europe/Berlin): 745 h of one-minute rows = 44,700 timestamps (the generator's design,
    // apps/api/src/modules/imports/demo-data.ts).
    const fresh = await figure(summary, 'New readings');
    const problemCount = await figure(summary, 'Problems');
    expect(problemCount).toBeGreaterThan(0);
    // Every cell of a mapped column is a new reading except the cells reported as problems
    // (the outage's blank cells count as readings: stored without a value, not valid).
    expect(fresh + problemCount).toBe(channels.length * 44_700);
    expect(await figure(summary, 'Already stored, same value')).toBe(0);
    expect(await figure(summary, 'Stored with another value')).toBe(0);
    expect(await figure(summary, 'Duplicate timestamps')).toBe(0);

    const totals = page.getByRole('table', { name: 'Totals per channel' });
    // A header row and one row per mapped channel.
    expect(await totals.getByRole('row').count()).toBe(channels.length + 1);
    await totals.getByRole('row').filter({ hasText: 'NOx' }).waitFor();

    await page.getByRole('heading', { name: 'Problems', exact: true }).waitFor();
    const problems = page.getByRole('table', { name: 'Problems', exact: true });
    const problemRows = problems.getByRole('row').filter({ hasNot: page.getByRole('columnheader') });
    expect(await problemRows.count()).toBe(Math.min(problemCount, 10));
    // The logger wrote "----" instead of numbers in a few cells: reported per cell.
    await problems.getByRole('cell', { name: '----', exact: true }).first().waitFor();
    const download = page.getByRole('link', { name: 'Download problems (.xlsx)' });
    expect(await download.getAttribute('href')).toMatch(/\/api\/imports\/[0-9a-f-]{36}\/problems\.xlsx$/);

    const samples = page.getByRole('table', { name: 'Sample rows' });
    expect(await samples.getByRole('row').count()).toBeGreaterThan(1);
    await page.screenshot({ path: '/tmp/fl-e2e-import-preview.png', fullPage: true });
    expectClean(officer);
  });

  it('commits with a progress bar and reports the readings stored', async () => {
    const { page } = officer;
    const summary = page.getByRole('region', { name: 'Import summary' });
    const fresh = await figure(summary, 'New readings');
    await page.getByRole('button', { name: 'Commit import' }).click();
    await page.getByRole('progressbar', { name: 'Commit progress' }).waitFor();

    const outcome = page.getByRole('status').filter({ has: page.getByRole('heading', { name: 'Import committed' }) });
    await outcome.waitFor({ timeout: 120_000 });
    const text = await outcome.innerText();
    stored = numberIn(/([\d,]+) new readings stored/.exec(text)?.[1] ?? 'NaN');
    expect(stored).toBe(fresh);
    expect(text).toContain('0 unchanged');
    expectClean(officer);
  }, 150_000);

  it('shows the month’s chart and the verdict of each limit in the data review', async () => {
    const { page } = officer;
    await page.getByRole('link', { name: 'Review the data' }).click();
    await page.waitForURL(new RegExp(`/review/stacks/${stackId}`));
    await page.getByRole('heading', { level: 1, name: 'Data review' }).waitFor();
    // Without a month in the address the review opens the latest month holding data: the file's.
    const month = page.getByLabel('Month', { exact: true });
    await page.getByRole('heading', { level: 2, name: /October 2026$/ }).waitFor();
    expect(await month.inputValue()).toBe('2026-10');
    // The same month from the address, as a bookmark would have it.
    await page.goto(`${baseUrl()}/review/stacks/${stackId}?month=2026-10`);
    await page.getByRole('heading', { level: 2, name: new RegExp(`^${stackName}`) }).waitFor();
    expect(await month.inputValue()).toBe('2026-10');

    const verdicts = page.getByRole('list', { name: 'Verdicts per limit' });
    await verdicts.waitFor();
    const entries = verdicts.getByRole('listitem').filter({ hasText: 'Data availability' });
    await entries.nth(limits.length - 1).waitFor();
    expect(await entries.count()).toBe(limits.length);
    // The file's NOx averages 68.6 mg/Nm3 at about 3.8 % O2 (the preview's totals): corrected to
    // 3 % O2 that is 68.6 × (21 − 3) / (21 − 3.8) ≈ 72 mg/Nm3 (IED 2010/75/EU Annex VI Part 4
    // formula [pub]), about 52 after the 20 mg/Nm3 confidence interval — within the monthly ELV
    // of 100. The 45-minute burner fault lifts its day by about 6 mg/Nm3, far from 110 % of the
    // ELV. So both verdicts are "Compliant", without exceedances.
    for (const period of ['monthly average', 'daily average']) {
      const entry = entries.filter({ hasText: period });
      const text = await entry.innerText();
      expect(text).toMatch(/^\s*\S*\s*Compliant\b/);
      expect(text).toContain('NOx ≤ 100 mg/Nm3');
      expect(text).toMatch(/Exceedances\s+0\b/);
      expect(text).toContain('Headroom');
      // Only the calibration hour and the analyser outage are missing from the month's 745 hours.
      const availability = /Data availability\s+([\d.]+) %/.exec(text);
      expect(Number(availability?.[1])).toBeGreaterThan(95);
      expect(Number(availability?.[1])).toBeLessThan(100);
    }
    expect(await verdicts.getByText(/^(Exceedance|Not enough valid data)$/).count()).toBe(0);

    const chart = page.getByRole('img', { name: /^Chart of hourly values/ });
    await chart.waitFor();
    const box = await chart.boundingBox();
    expect(box?.width ?? 0).toBeGreaterThan(300);
    expect(box?.height ?? 0).toBeGreaterThan(200);

    // O2/CO2 plausibility: measured CO2 against CO2max · (20.9 − O2)/20.9 from the fuel's analysis
    // (REFERENCES.md §1; CO2max of the seeded grid gas 11.96 % dry). The example's CO2 analyser
    // loses span from 16 October 00:00 to 85 % of reading at 19 October 10:00 (demo-data.ts): the
    // hours past the review's 10 % tolerance (common practice) are the drift's last day, 18–19
    // October, and no other hour of the month departs that far.
    await page.getByRole('heading', { level: 2, name: 'O2/CO2 plausibility' }).waitFor();
    const plausibilitySummary = await page.getByText(/hours checked where the measured CO2 departs/).innerText();
    const [, flaggedHours, checkedHours] = /(\d+) of ([\d,]+) hours checked/.exec(plausibilitySummary) ?? [];
    expect(Number(flaggedHours)).toBeGreaterThanOrEqual(20);
    expect(Number(flaggedHours)).toBeLessThanOrEqual(34);
    expect(numberIn(checkedHours ?? 'NaN')).toBeGreaterThan(700);
    const flags = page.getByRole('list', { name: 'Plausibility flags' });
    const flagTexts = await flags.getByRole('listitem').allInnerTexts();
    // The ten largest departures, each dated in the drift window and below −10 %.
    expect(flagTexts).toHaveLength(10);
    for (const text of flagTexts) {
      expect(text).toMatch(/^\s*1[89] Oct 2026, \d\d:\d\d/);
      const deviation = /\((-[\d.]+) %\)\s*$/.exec(text)?.[1];
      expect(Number(deviation)).toBeLessThan(-10);
    }

    const hourly = page.getByRole('table', { name: 'Hourly values' });
    await hourly.getByRole('row').nth(1).waitFor();
    await page.screenshot({ path: '/tmp/fl-e2e-import-review.png', fullPage: true });
    expectClean(officer);
  });

  it('reports "Nothing new" when the same file is imported again', async () => {
    const { page } = officer;
    await page.getByRole('navigation').getByRole('link', { name: 'Import', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Import monitoring data' }).waitFor();
    await page.goto(`${baseUrl()}/imports/stacks/${stackId}`);
    await page.getByRole('heading', { level: 2, name: new RegExp(`^${stackName}`) }).waitFor();

    await uploadAndConfirm(page, { firstTime: false });
    const summary = page.getByRole('region', { name: 'Import summary' });
    expect(await figure(summary, 'New readings')).toBe(0);
    expect(await figure(summary, 'Stored with another value')).toBe(0);
    expect(await figure(summary, 'Already stored, same value')).toBe(stored);

    await page.getByRole('button', { name: 'Commit import' }).click();
    const outcome = page.getByRole('status').filter({ has: page.getByRole('heading', { name: 'Nothing new' }) });
    await outcome.waitFor({ timeout: 120_000 });
    expect(await outcome.innerText()).toContain('already stored for this stack');
    expect(await page.getByRole('heading', { name: 'Import committed' }).count()).toBe(0);
    await page.screenshot({ path: '/tmp/fl-e2e-import-nothing-new.png', fullPage: true });
    expectClean(officer);
  }, 150_000);
});
