import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatTableHarness } from '@angular/material/table/testing';

import { ImportProblem } from '../../../core/api/imports-api';
import { PROGRESS_POLL_INTERVAL_MS } from '../progress-polling';
import { previewFixture, testChannels } from '../testing/import-fixtures';
import { PreviewStep } from './preview-step';

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

describe('PreviewStep', () => {
  let fixture: ComponentFixture<PreviewStep>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: PROGRESS_POLL_INTERVAL_MS, useValue: 3_600_000 }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PreviewStep);
    fixture.componentRef.setInput('importId', 'imp-1');
    fixture.componentRef.setInput('channels', testChannels);
    fixture.componentRef.setInput('timeZone', 'Europe/Berlin');
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
  });

  afterEach(() => http.verify());

  async function answer(preview = previewFixture()): Promise<void> {
    http.expectOne({ method: 'GET', url: '/api/imports/imp-1/preview' }).flush(preview);
    await settle(fixture);
  }

  const table = (label: string) => loader.getHarness(MatTableHarness.with({ selector: `[aria-label="${label}"], [aria-labelledby="${label}"]` }));

  it('lists every problem with its row, column, value and reason, and links the workbook', async () => {
    await answer();
    const rows = await (await table('problems-heading')).getCellTextByColumnName();
    expect(rows['row'].text).toEqual(['4', '905']);
    expect(rows['column'].text).toEqual(['B (NOx mg/Nm3 dry)', 'B (NOx mg/Nm3 dry)']);
    expect(rows['value'].text).toEqual(['ERR', '#N/A']);
    expect(rows['reason'].text).toEqual(['Not a number', 'The cell holds a spreadsheet error']);

    const download = await loader.getHarness(MatButtonHarness.with({ text: /Download problems/ }));
    expect(await (await download.host()).getAttribute('href')).toBe('/api/imports/imp-1/problems.xlsx');
  });

  it('pages a long problem list and says the workbook holds the rest', async () => {
    const problems: ImportProblem[] = Array.from({ length: 500 }, (_, i) => ({
      row: i + 2, column: 'C (O2 %)', columnIndex: 2, value: 'n/a', code: 'not_a_number', reason: 'Not a number',
    }));
    await answer(previewFixture({ problems, problemCount: 1_210 }));

    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Showing the first 500 of 1,210 problems.');
    const paginator = await loader.getHarness(MatPaginatorHarness);
    expect(await paginator.getRangeLabel()).toBe('1 – 10 of 500');
    await paginator.goToNextPage();
    const rows = await (await table('problems-heading')).getCellTextByColumnName();
    expect(rows['row'].text[0]).toBe('12');
  });

  it('shows totals per channel, the overlap with stored data and the gaps', async () => {
    await answer();
    const totals = await (await table('Totals per channel')).getCellTextByColumnName();
    expect(totals['channel'].text).toEqual(['NOx (as NO2) · mg/Nm3, dry', 'O2 · %, dry']);
    expect(totals['invalid'].text).toEqual(['2', '0']);
    expect(totals['max'].text).toEqual(['212.4', '6.4']);

    const summary = (fixture.nativeElement as HTMLElement).querySelector('[aria-label="Import summary"]')?.textContent ?? '';
    expect(summary).toMatch(/New readings\s*86,398/);
    expect(summary).toMatch(/Stored with another value\s*0/);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('12 Nov 2026, 10:00');
  });

  it('says "Nothing new" when every value is already stored', async () => {
    await answer(previewFixture({ overlap: { new: 0, unchanged: 86_398, conflicting: 0 } }));
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Nothing new');
  });
});
