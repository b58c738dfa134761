import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';

import { Role } from '../../../core/api/auth-api';
import { Channel } from '../../../core/api/sites-api';
import { authAs, settle, siteDetail } from '../testing/setup-fixtures';
import { StackEditor } from './stack-editor';

jest.setTimeout(30_000);

describe('StackEditor', () => {
  let fixture: ComponentFixture<StackEditor>;
  let loader: HarnessLoader;
  let documentLoader: HarnessLoader;
  let http: HttpTestingController;
  const site = siteDetail();

  async function open(role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        authAs(role),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StackEditor);
    fixture.componentRef.setInput('siteId', 'site-1');
    fixture.componentRef.setInput('stackId', 'stack-1');
    loader = TestbedHarnessEnvironment.loader(fixture);
    documentLoader = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush(site);
    http.expectOne('/api/stacks/stack-1').flush(site.stacks[0]);
    await settle(fixture);
  }

  async function channelRows(): Promise<Record<string, string>[]> {
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[aria-labelledby="channels-heading"]' }));
    return Promise.all((await table.getRows()).map((row) => row.getCellTextByColumnName()));
  }

  afterEach(() => http.verify());

  it('adds a NOx channel; its units follow the parameter', async () => {
    await open('officer');
    expect((await channelRows()).map((row) => row['parameter'])).toEqual(['O2']);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Add channel/ }))).click();
    await settle(fixture);
    const dialog = await documentLoader.getHarness(MatDialogHarness);
    const select = async (label: string) =>
      (await (await dialog.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }))).getControl(MatSelectHarness))!;

    await (await select('Parameter')).clickOptions({ text: 'Dust' });
    const unit = await select('Unit');
    await unit.open();
    // A dust monitor cannot report ppm: no molar mass for particles.
    expect(await Promise.all((await unit.getOptions()).map((o) => o.getText()))).toEqual(['mg/Nm3', 'µg/Nm3']);
    // Choosing closes the panel (Escape would close the dialog too).
    await unit.clickOptions({ text: 'µg/Nm3' });

    // O2 is reported in % only: the unit follows.
    await (await select('Parameter')).clickOptions({ text: 'O2' });
    expect(await (await select('Unit')).getValueText()).toBe('%');
    await (await select('Parameter')).clickOptions({ text: 'NOx (as NO2)' });
    expect(await (await select('Unit')).getValueText()).toBe('mg/Nm3');
    expect(await (await select('Basis')).getValueText()).toBe('Dry basis');

    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save channel' }))).click();
    await settle(fixture);
    const request = http.expectOne('/api/stacks/stack-1/channels');
    expect(request.request.body).toEqual({
      parameter: 'NOx',
      unit: 'mg/Nm3',
      basis: 'dry',
      conditions: 'standard',
      rangeMin: null,
      rangeMax: null,
      intervalMinutes: 1,
      sourceLabel: null,
    });
    const saved: Channel = { ...site.stacks[0].channels[0], id: 'channel-nox', parameter: 'NOx', unit: 'mg/Nm3', rangeMin: null, rangeMax: null, sourceLabel: null };
    request.flush(saved);
    await settle(fixture, 50);

    expect((await channelRows()).map((row) => row['parameter'])).toEqual(['NOx (as NO2)', 'O2']);
  });

  it('shows an auditor the stack and its channels with no edit controls', async () => {
    await open('auditor');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Add channel|Save|Archive/ }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Edit channel"]' }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatFormFieldHarness.with({ floatingLabelText: 'Name' }))).toHaveLength(0);
    expect((await channelRows())[0]).toEqual(expect.objectContaining({ parameter: 'O2', unit: '%', sourceLabel: 'O2_DRY' }));
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('60 m');
  });
});
