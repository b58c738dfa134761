/**
 * Browser end-to-end of the set-up screens (issue 5): the officer describes a new site — an
 * emission unit, a stack with O2 and NOx channels, a natural-gas fuel and a permit with a daily
 * NOx limit — reloads and finds everything again; the auditor opens the same pages and finds
 * no edit control. No console error (CSP violations included) and no request leaves loopback.
 *
 * The site's name carries the run's timestamp so reruns against the same database pass.
 */
import type { Locator, Page } from 'playwright-core';

import { baseUrl, launch, signIn, type BrowserSession, type WatchedPage } from './browser';

const runId = new Date().toISOString().replace(/\D/g, '').slice(0, 14);
const siteName = `Eastbrook Board Mill ${runId}`;
const unitName = 'Boiler 1';
const stackName = 'Boiler 1 stack';
const fuelName = 'Pipeline natural gas';
const permitReference = `EBM-IED-${runId}`;

const uuid = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';

/** The pages the officer created; the auditor visits the same addresses. */
const pages: { site?: string; unit?: string; stack?: string; fuel?: string; permit?: string } = {};

let session: BrowserSession;
let officer: WatchedPage;

beforeAll(async () => {
  session = await launch();
  officer = await session.newPage();
  officer.page.setDefaultTimeout(20_000);
});
afterAll(async () => {
  await session?.close();
});

function expectClean(w: WatchedPage): void {
  expect(w.consoleErrors).toEqual([]);
  expect(w.externalRequests).toEqual([]);
}

/**
 * Opens a Material select from the keyboard (focus, Enter): a long floating label may cover the
 * middle of an empty select, where a pointer click would land on the label instead.
 */
async function open(scope: Page | Locator, page: Page, label: string): Promise<void> {
  await scope.getByRole('combobox', { name: label, exact: true }).focus();
  await page.keyboard.press('Enter');
  await page.getByRole('listbox').waitFor();
}

/** Opens a Material select by its label and picks one option by its visible text. */
async function choose(scope: Page | Locator, page: Page, label: string, option: string): Promise<void> {
  await open(scope, page, label);
  await page.getByRole('option', { name: option, exact: true }).click();
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

/** Picks options of a multiple select, then closes its panel with Escape as a keyboard user would. */
async function chooseMany(page: Page, label: string, options: string[]): Promise<void> {
  await open(page, page, label);
  for (const option of options) await page.getByRole('option', { name: option, exact: true }).click();
  await page.keyboard.press('Escape');
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

/** The data rows of a table (named by its heading) that contain the text. */
function rowsOf(page: Page, table: string, text: string): Locator {
  return page.getByRole('table', { name: table, exact: true }).getByRole('row').filter({ hasText: text });
}

/** Waits until the site page shows its tables. */
async function siteLoaded(page: Page): Promise<void> {
  await page.waitForURL(new RegExp(`/sites/${uuid}$`));
  await page.getByRole('heading', { level: 1, name: siteName }).waitFor();
  await page.getByRole('table', { name: 'Permits', exact: true }).waitFor();
}

/** "9,595.1 Nm3 air/Nm3 fuel" → 9595.1 */
const numberIn = (text: string): number => Number.parseFloat(text.replace(/,/g, '').replace(/^[^\d-]*/, ''));

describe('setting up a site', () => {
  it('lets the officer create a site', async () => {
    const { page } = officer;
    await signIn(page, 'officer@northmoor.example');
    await page.waitForURL(`${baseUrl()}/overview`);

    await page.getByRole('navigation').getByRole('link', { name: 'Sites', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Sites' }).waitFor();
    await page.getByRole('link', { name: 'New site' }).click();

    await page.getByLabel('Name', { exact: true }).fill(siteName);
    const timeZone = page.getByRole('combobox', { name: 'Time zone' });
    await timeZone.fill('Europe/Ber');
    await page.getByRole('option', { name: 'Europe/Berlin', exact: true }).click();
    expect(await timeZone.inputValue()).toBe('Europe/Berlin');
    await page.getByLabel('Country', { exact: true }).fill('de');
    // The hint names the country the code stands for.
    await page.getByText('Germany', { exact: true }).waitFor();
    await choose(page, page, 'Regulatory regime', 'EU Industrial Emissions Directive');
    await page.getByLabel('Address', { exact: true }).fill('Mühlenweg 12\n99999 Musterstadt');
    await page.getByRole('button', { name: 'Create site' }).click();

    await siteLoaded(page);
    pages.site = new URL(page.url()).pathname;
    expectClean(officer);
  });

  it('adds a natural-gas fuel and shows its combustion figures while the officer types', async () => {
    const { page } = officer;
    await page.getByRole('link', { name: 'Add fuel' }).click();
    await page.getByRole('heading', { level: 1, name: 'New fuel' }).waitFor();

    await page.getByLabel('Name', { exact: true }).fill(fuelName);
    // Natural gas is the default fuel type.
    await expect(page.getByRole('combobox', { name: 'Fuel type' }).innerText()).resolves.toContain('Natural gas');
    await page.getByLabel('Valid from', { exact: true }).fill('2026-01-01');
    const composition: Array<[string, string]> = [
      ['Methane CH4', '93'],
      ['Ethane C2H6', '3'],
      ['Propane C3H8', '1'],
      ['Carbon dioxide CO2', '1'],
      ['Nitrogen N2', '2'],
    ];
    for (const [label, molPercent] of composition) await page.getByLabel(label, { exact: true }).fill(molPercent);

    const figures = page.getByRole('table', { name: 'Combustion figures' });
    const air = figures.getByRole('row').filter({ hasText: /^\s*Stoichiometric air\s/ }).getByRole('cell').nth(1);
    const co2Max = figures.getByRole('row').filter({ hasText: /^\s*CO2max/ }).getByRole('cell').nth(1);
    await air.waitFor();
    // O2 demand Σ x_i (nC + nH/4) = 0.93·2 + 0.03·3.5 + 0.01·5 = 2.015 mol/mol; air = 2.015/0.21
    // = 9.595 Nm3/Nm3 [derived, combustion stoichiometry, Turns ch. 2 — REFERENCES.md §1].
    expect(numberIn(await air.innerText())).toBeCloseTo(9.595, 2);
    // CO2max = CO2 (0.93 + 0.06 + 0.03 + 0.01 = 1.03) / dry flue gas (1.03 + 0.02 + 0.79·9.595
    // = 8.630) = 11.94 % dry [derived, same source].
    expect(numberIn(await co2Max.innerText())).toBeCloseTo(11.94, 1);

    await page.getByRole('button', { name: 'Create fuel' }).click();
    await siteLoaded(page);
    await rowsOf(page, 'Fuels', fuelName).waitFor();
    expectClean(officer);
  });

  it('adds an emission unit that burns the fuel', async () => {
    const { page } = officer;
    await page.getByRole('link', { name: 'Add emission unit' }).click();
    await page.getByRole('heading', { level: 1, name: 'New emission unit' }).waitFor();

    await page.getByLabel('Name', { exact: true }).fill(unitName);
    await choose(page, page, 'Unit type', 'Boiler');
    await page.getByLabel('Rated thermal input', { exact: true }).fill('38.5');
    await page.getByLabel('In service from', { exact: true }).fill('2012-05-01');
    await chooseMany(page, 'Fuels burned', [fuelName]);
    await page.getByRole('button', { name: 'Create emission unit' }).click();

    await siteLoaded(page);
    const row = rowsOf(page, 'Emission units', unitName);
    await row.waitFor();
    expect(await row.innerText()).toContain('38.5 MWth');
    expect(await row.innerText()).toContain(fuelName);
    expectClean(officer);
  });

  it('adds a stack for the unit with O2 and NOx channels', async () => {
    const { page } = officer;
    await page.getByRole('link', { name: 'Add stack' }).click();
    await page.getByRole('heading', { level: 1, name: 'New stack' }).waitFor();

    await page.getByLabel('Name', { exact: true }).fill(stackName);
    await page.getByLabel('Height', { exact: true }).fill('45');
    await page.getByLabel('Diameter', { exact: true }).fill('1.8');
    await chooseMany(page, 'Emission units', [unitName]);
    await page.getByRole('button', { name: 'Create stack' }).click();

    await page.waitForURL(new RegExp(`/sites/${uuid}/stacks/${uuid}$`));
    await page.getByRole('heading', { level: 1, name: stackName }).waitFor();
    pages.stack = new URL(page.url()).pathname;

    const channels: Array<{ parameter: string; unit: string }> = [
      { parameter: 'O2', unit: '%' },
      { parameter: 'NOx (as NO2)', unit: 'mg/Nm3' },
    ];
    for (const { parameter, unit } of channels) {
      await page.getByRole('button', { name: 'Add channel' }).click();
      const dialog = page.getByRole('dialog', { name: 'Add channel' });
      await dialog.waitFor();
      await choose(dialog, page, 'Parameter', parameter);
      // The unit follows the parameter (O2 is reported in %, NOx in mg/Nm3 by default).
      await expect(dialog.getByRole('combobox', { name: 'Unit', exact: true }).innerText()).resolves.toBe(unit);
      await expect(dialog.getByRole('combobox', { name: 'Basis', exact: true }).innerText()).resolves.toBe('Dry basis');
      await dialog.getByRole('button', { name: 'Save channel' }).click();
      await dialog.waitFor({ state: 'detached' });
      await rowsOf(page, 'Channels', parameter).first().waitFor();
    }
    expectClean(officer);
  });

  it('adds a permit with a daily NOx limit on the stack', async () => {
    const { page } = officer;
    await page.goto(`${baseUrl()}${pages.site}`);
    await siteLoaded(page);
    await page.getByRole('link', { name: 'Add permit' }).click();
    await page.getByRole('heading', { level: 1, name: 'New permit' }).waitFor();

    await page.getByLabel('Reference', { exact: true }).fill(permitReference);
    await page.getByLabel('Authority', { exact: true }).fill('Musterstadt district environmental office');
    await page.getByLabel('Effective from', { exact: true }).fill('2026-01-01');
    await page.getByRole('button', { name: 'Create permit' }).click();

    await page.waitForURL(new RegExp(`/sites/${uuid}/permits/${uuid}$`));
    await page.getByRole('heading', { level: 1, name: `Permit ${permitReference}` }).waitFor();
    pages.permit = new URL(page.url()).pathname;

    await page.getByRole('button', { name: 'Add limit' }).click();
    const dialog = page.getByRole('dialog', { name: 'Add limit' });
    await dialog.waitFor();
    await expect(dialog.getByRole('combobox', { name: 'Applies to' }).innerText()).resolves.toBe(`Stack: ${stackName}`);
    await expect(dialog.getByRole('combobox', { name: 'Pollutant' }).innerText()).resolves.toBe('NOx (as NO2)');
    await expect(dialog.getByRole('combobox', { name: 'Averaging period' }).innerText()).resolves.toBe('Daily average');
    // Gas-fired boiler under the IED: reference O2 3 % (IED 2010/75/EU Annex V Part 1 [pub],
    // REFERENCES.md §4), pre-filled from the stack's unit and its fuel.
    const referenceO2 = dialog.getByLabel('Reference O2', { exact: true });
    await dialog.getByText(/^Pre-filled from/).waitFor();
    expect(await referenceO2.inputValue()).toBe('3');
    await dialog.getByLabel('Emission limit value', { exact: true }).fill('100');
    // IED 2010/75/EU Annex V Part 4: no validated daily average may exceed 110 % of the ELV
    // [pub, point 1(b) from memory; REFERENCES.md §5].
    await dialog.getByLabel('Threshold', { exact: true }).fill('110');
    await dialog.getByRole('button', { name: 'Save limit' }).click();
    await dialog.waitFor({ state: 'detached' });

    const limit = rowsOf(page, 'Emission limits', stackName);
    await limit.waitFor();
    const summary = await limit.getByRole('cell').nth(4).innerText();
    expect(summary).toContain('NOx ≤ 100 mg/Nm3');
    expect(summary).toContain('dry, 3 % O2');
    expect(summary).toContain('daily average');
    expect(summary).toContain('110 % of ELV');
    expectClean(officer);
  });

  it('finds everything again after a reload', async () => {
    const { page } = officer;
    await page.reload();
    const limit = rowsOf(page, 'Emission limits', stackName);
    await limit.waitFor();
    expect(await limit.innerText()).toContain('NOx ≤ 100 mg/Nm3');

    await page.goto(`${baseUrl()}${pages.site}`);
    await page.reload();
    await siteLoaded(page);
    await rowsOf(page, 'Emission units', unitName).waitFor();
    expect(await rowsOf(page, 'Stacks', stackName).innerText()).toContain('45 m');
    expect(await rowsOf(page, 'Monitored channels', stackName).count()).toBe(2);
    await rowsOf(page, 'Monitored channels', 'NOx').waitFor();
    await rowsOf(page, 'Monitored channels', 'O2').first().waitFor();
    await rowsOf(page, 'Fuels', fuelName).waitFor();
    await rowsOf(page, 'Permits', permitReference).waitFor();
    // The officer's edit commands are found by the same reading of the accessibility tree that
    // must find none for the auditor below.
    const commands = (await controlsOf(page)).map((c) => c.name);
    for (const command of ['Edit site', 'Add emission unit', 'Add stack', 'Add fuel', 'Add permit']) {
      expect(commands).toContain(command);
    }

    // Remember the unit and fuel pages for the auditor.
    pages.unit = new URL(
      await rowsOf(page, 'Emission units', unitName).getByRole('link', { name: unitName }).evaluate((a) => (a as HTMLAnchorElement).href),
    ).pathname;
    pages.fuel = new URL(
      await rowsOf(page, 'Fuels', fuelName).getByRole('link', { name: fuelName }).evaluate((a) => (a as HTMLAnchorElement).href),
    ).pathname;

    await page.goto(`${baseUrl()}${pages.stack}`);
    await page.getByRole('heading', { level: 1, name: stackName }).waitFor();
    await rowsOf(page, 'Channels', 'NOx').waitFor();
    expect(await page.getByRole('table', { name: 'Channels', exact: true }).getByRole('row').count()).toBe(3);
    const stackControls = await controlsOf(page);
    expect(stackControls).toContainEqual({ role: 'button', name: 'Add channel' });
    expect(stackControls).toContainEqual({ role: 'textbox', name: 'Name' });
    expectClean(officer);
  });
});

/** Interactive elements of the page's main region, from its accessibility tree: role and name. */
async function controlsOf(page: Page): Promise<Array<{ role: string; name: string }>> {
  const yaml = await page.getByRole('main').ariaSnapshot();
  const controls: Array<{ role: string; name: string }> = [];
  for (const line of yaml.split('\n')) {
    const match = /^\s*- (button|link|textbox|spinbutton|combobox|checkbox|radio|switch|slider)(?: "((?:[^"\\]|\\.)*)")?/.exec(line);
    if (match) controls.push({ role: match[1], name: match[2] ?? '' });
  }
  return controls;
}

/** Commands that change a record. */
const EDIT_COMMAND = /^(add|new|edit|create|save|archive|upload|replace|delete|remove)\b/i;
/**
 * Inputs an auditor may use: filters, page size and the fuel panel's what-if O2, which is
 * never saved.
 */
const READ_ONLY_INPUT = /^(Filter\b|Items per page|Flue-gas O2 for the figures below)/;

describe('the auditor', () => {
  let auditor: WatchedPage;
  beforeAll(async () => {
    auditor = await session.newPage();
    auditor.page.setDefaultTimeout(20_000);
    await signIn(auditor.page, 'auditor@northmoor.example');
    await auditor.page.waitForURL(`${baseUrl()}/overview`);
  });

  const visits: Array<{ page: keyof typeof pages | 'list'; shows: () => string[] }> = [
    { page: 'list', shows: () => [siteName] },
    { page: 'site', shows: () => [siteName, unitName, stackName, fuelName, permitReference] },
    { page: 'unit', shows: () => [unitName, 'Boiler', '38.5', fuelName] },
    { page: 'stack', shows: () => [stackName, 'NOx', 'O2', 'Dry basis'] },
    { page: 'fuel', shows: () => [fuelName, 'Natural gas', 'Gross calorific value', 'Stoichiometric air'] },
    { page: 'permit', shows: () => [permitReference, 'NOx ≤ 100 mg/Nm3'] },
  ];

  it.each(visits)('sees the $page page without edit controls', async ({ page: which, shows }) => {
    const { page } = auditor;
    if (which === 'list') {
      await page.goto(`${baseUrl()}/sites`);
      await page.getByRole('heading', { level: 1, name: 'Sites' }).waitFor();
      await page.getByLabel('Filter sites').fill(runId);
    } else {
      const path = pages[which];
      if (!path) throw new Error(`the officer's part did not reach the ${which} page`);
      await page.goto(`${baseUrl()}${path}`);
    }
    const main = page.getByRole('main');
    for (const text of shows()) await main.getByText(text).first().waitFor();
    await page.waitForLoadState('networkidle');

    // Figures are shown as people read them, never at full double precision.
    expect(await main.innerText()).not.toMatch(/\d\.\d{5,}/);

    const controls = await controlsOf(page);
    const commands = controls.filter((c) => (c.role === 'button' || c.role === 'link') && EDIT_COMMAND.test(c.name));
    const inputs = controls.filter((c) => !['button', 'link'].includes(c.role) && !READ_ONLY_INPUT.test(c.name));
    expect(commands).toEqual([]);
    expect(inputs).toEqual([]);
    // Row commands are icon buttons named by their aria-label; none may be rendered either.
    expect(await main.getByRole('button', { name: /^(Edit|Archive) (channel|limit)/ }).count()).toBe(0);
    expectClean(auditor);
  });

  it('is sent away from the new-site form when typing its address', async () => {
    const { page } = auditor;
    await page.goto(`${baseUrl()}/sites/new`);
    await page.waitForLoadState('networkidle');
    expect(new URL(page.url()).pathname).not.toBe('/sites/new');
    expect(await page.getByRole('button', { name: 'Create site' }).count()).toBe(0);
    expectClean(auditor);
  });
});
