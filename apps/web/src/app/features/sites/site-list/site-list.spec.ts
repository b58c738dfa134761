import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';

import { Role } from '../../../core/api/auth-api';
import { authAs, settle, siteDetail } from '../testing/setup-fixtures';
import { SiteList } from './site-list';

jest.setTimeout(30_000);

describe('SiteList', () => {
  let fixture: ComponentFixture<SiteList>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  async function open(role: Role): Promise<void> {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), authAs(role)] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SiteList);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture, 250);
  }

  async function answer(expected: Record<string, string>, items = [siteDetail()], total = items.length): Promise<void> {
    const request = http.expectOne((req) => req.url === '/api/sites');
    const params = Object.fromEntries(request.request.params.keys().map((key) => [key, request.request.params.get(key)]));
    expect(params).toEqual(expected);
    request.flush({ items, total });
    await settle(fixture);
  }

  afterEach(() => http.verify());

  it('lists the sites with their regime and offers the officer a new one', async () => {
    await open('officer');
    await answer({ limit: '25', offset: '0', sort: 'name', order: 'asc' });
    const rows = await (await loader.getHarness(MatTableHarness)).getRows();
    const cells = await rows[0].getCellTextByColumnName();
    expect(cells['name']).toBe('Harbourside Mill');
    expect(cells['regime']).toBe('EU Industrial Emissions Directive');
    expect(cells['country']).toContain('(DE)');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /New site/ }))).toHaveLength(1);
  });

  it('filters and sorts on the server', async () => {
    await open('officer');
    await answer({ limit: '25', offset: '0', sort: 'name', order: 'asc' });
    await (await loader.getHarness(MatInputHarness.with({ placeholder: 'Name or country code' }))).setValue('harb');
    await settle(fixture, 250);
    await answer({ limit: '25', offset: '0', sort: 'name', order: 'asc', q: 'harb' });

    const [, country] = await (await loader.getHarness(MatSortHarness)).getSortHeaders();
    await country.click();
    await settle(fixture, 250);
    await answer({ limit: '25', offset: '0', sort: 'country', order: 'asc', q: 'harb' });
  });

  it('tells an officer with no sites what to do next', async () => {
    await open('officer');
    await answer({ limit: '25', offset: '0', sort: 'name', order: 'asc' }, []);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Choose “New site” to describe your first plant');
  });

  it('gives an auditor no New site button', async () => {
    await open('auditor');
    await answer({ limit: '25', offset: '0', sort: 'name', order: 'asc' }, []);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /New site/ }))).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('An environmental officer sets them up.');
  });
});
