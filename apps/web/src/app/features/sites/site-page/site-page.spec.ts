import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';

import { Role } from '../../../core/api/auth-api';
import { authAs, settle, siteDetail } from '../testing/setup-fixtures';
import { SitePage } from './site-page';

jest.setTimeout(30_000);

describe('SitePage', () => {
  let fixture: ComponentFixture<SitePage>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  async function open(role: Role): Promise<void> {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), authAs(role)] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SitePage);
    fixture.componentRef.setInput('siteId', 'site-1');
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush(siteDetail());
    http.expectOne((req) => req.url === '/api/sites/site-1/permits').flush({ items: [], total: 0 });
    await settle(fixture);
  }

  async function table(heading: string): Promise<Record<string, string>[]> {
    const harness = await loader.getHarness(MatTableHarness.with({ selector: `[aria-labelledby="${heading}"]` }));
    return Promise.all((await harness.getRows()).map((row) => row.getCellTextByColumnName()));
  }

  afterEach(() => http.verify());

  it('shows units, stacks, channels and fuels in one place', async () => {
    await open('officer');
    expect((await table('units-heading'))[0]).toEqual(
      expect.objectContaining({ name: 'Boiler 2', type: 'Boiler', ratedThermalInputMWth: '48 MWth', fuels: 'Pipeline gas' }),
    );
    expect((await table('stacks-heading'))[0]).toEqual(expect.objectContaining({ name: 'Main stack', units: 'Boiler 2', channels: 'O2' }));
    expect((await table('channels-heading'))[0]).toEqual(
      expect.objectContaining({ stack: 'Main stack', parameter: 'O2', unit: '%', basis: 'Dry basis', range: '0 – 25 %' }),
    );
    expect((await table('fuels-heading'))[0]).toEqual(expect.objectContaining({ name: 'Pipeline gas', type: 'Natural gas' }));
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No permits yet.');
  });

  it('filters every table at once', async () => {
    await open('officer');
    await (await loader.getHarness(MatInputHarness.with({ placeholder: 'Name, pollutant, fuel …' }))).setValue('boiler');
    await settle(fixture);
    expect(await table('units-heading')).toHaveLength(1);
    expect(await table('fuels-heading')).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No fuel matches “boiler”.');
  });

  it('gives the officer the buttons that add records', async () => {
    await open('officer');
    const texts = await Promise.all((await loader.getAllHarnesses(MatButtonHarness)).map((b) => b.getText()));
    for (const label of ['Edit site', 'Add emission unit', 'Add stack', 'Add fuel', 'Add permit']) {
      expect(texts.some((text) => text.includes(label))).toBe(true);
    }
  });

  it('shows an auditor everything with no edit controls', async () => {
    await open('auditor');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Edit|Add/ }))).toHaveLength(0);
    expect(await table('units-heading')).toHaveLength(1);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No permits have been set up for this site.');
  });
});
