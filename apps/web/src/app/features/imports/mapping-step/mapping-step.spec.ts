import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';

import { ImportDraft, MappingBody } from '../../../core/api/imports-api';
import { PROGRESS_POLL_INTERVAL_MS } from '../progress-polling';
import { draftFixture, testChannels } from '../testing/import-fixtures';
import { MappingStep } from './mapping-step';

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

describe('MappingStep', () => {
  let fixture: ComponentFixture<MappingStep>;
  let loader: HarnessLoader;
  let http: HttpTestingController;
  let emitted: ImportDraft[];

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), { provide: PROGRESS_POLL_INTERVAL_MS, useValue: 3_600_000 }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MappingStep);
    fixture.componentRef.setInput('draft', draftFixture());
    fixture.componentRef.setInput('channels', testChannels);
    fixture.componentRef.setInput('timeZone', 'Europe/Berlin');
    emitted = [];
    fixture.componentInstance.mapped.subscribe((draft) => emitted.push(draft));
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
  });

  afterEach(() => http.verify());

  async function channelSelect(letter: string): Promise<MatSelectHarness> {
    return loader.getHarness(MatSelectHarness.with({ selector: `[aria-label^="Channel for column ${letter} "]` }));
  }

  it('shows each column with the suggested channel already chosen', async () => {
    const rows = await (await loader.getHarness(MatTableHarness)).getRows();
    const cells = await Promise.all(rows.map((row) => row.getCellTextByColumnName()));
    expect(cells.map((c) => c['column'])).toEqual(['B NOx mg/Nm3 dry', 'C O2 %', 'D Spare 1']);
    expect(cells[0]['suggested']).toContain('NOx (as NO2) · mg/Nm3, dry');
    expect(cells[0]['suggested']).toContain('from the header and unit');

    expect(await (await channelSelect('B')).getValueText()).toBe('NOx (as NO2) · mg/Nm3, dry');
    expect(await (await channelSelect('C')).getValueText()).toBe('O2 · %, dry');
    // No suggestion for an unknown header: the column stays out unless the officer picks a channel.
    expect(await (await channelSelect('D')).isEmpty()).toBe(true);
  });

  it('shows the timestamp and status columns the server found, though they are not value columns', async () => {
    fixture.componentRef.setInput('draft', draftFixture({ statusColumn: 4 }));
    fixture.componentInstance.ngOnInit();
    await settle(fixture);
    const timestamp = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="timestampColumn"]' }));
    expect(await timestamp.getValueText()).toBe('A · Time');
    const status = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="statusColumn"]' }));
    expect(await status.getValueText()).toBe('E · (status)');
    await status.open();
    const options = await status.getOptions();
    expect(await Promise.all(options.map((o) => o.getText()))).toEqual([
      'None',
      'A · Time',
      'B · NOx mg/Nm3 dry',
      'C · O2 %',
      'D · Spare 1',
      'E · (status)',
    ]);
  });

  it('sends the confirmed mapping, with a changed column and the wish to remember it', async () => {
    const spare = await channelSelect('D');
    await spare.open();
    await spare.clickOptions({ text: 'CO · mg/Nm3, dry' });
    expect(await (await loader.getHarness(MatCheckboxHarness.with({ label: 'Remember this mapping for the stack' }))).isChecked()).toBe(true);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Confirm mapping/ }))).click();

    const request = http.expectOne({ method: 'PUT', url: '/api/imports/imp-1/mapping' });
    const body = request.request.body as MappingBody;
    expect(body).toEqual({
      columns: [
        { index: 1, channelId: 'ch-nox' },
        { index: 2, channelId: 'ch-o2' },
        { index: 3, channelId: 'ch-co' },
      ],
      timestampColumn: 0,
      statusColumn: null,
      intervalConvention: 'interval_end',
      saveAsStackMap: true,
    });
    request.flush(draftFixture({ state: 'mapped' }));
    await settle(fixture);
    expect(emitted.map((draft) => draft.state)).toEqual(['mapped']);
  });

  it('refuses one channel for two columns and sends nothing', async () => {
    const spare = await channelSelect('D');
    await spare.open();
    await spare.clickOptions({ text: 'NOx (as NO2) · mg/Nm3, dry' });
    await (await loader.getHarness(MatButtonHarness.with({ text: /Confirm mapping/ }))).click();

    http.expectNone('/api/imports/imp-1/mapping');
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('A channel is chosen for more than one column.');
    expect(emitted).toHaveLength(0);
  });

  it('leaves a column out when the officer unticks remembering and drops its channel', async () => {
    await (await loader.getHarness(MatCheckboxHarness.with({ label: 'Remember this mapping for the stack' }))).uncheck();
    const o2 = await channelSelect('C');
    await o2.open();
    await o2.clickOptions({ text: 'Do not import' });
    await (await loader.getHarness(MatButtonHarness.with({ text: /Confirm mapping/ }))).click();

    const request = http.expectOne({ method: 'PUT', url: '/api/imports/imp-1/mapping' });
    const body = request.request.body as MappingBody;
    expect(body.saveAsStackMap).toBe(false);
    expect(body.columns.find((c) => c.index === 2)).toEqual({ index: 2, channelId: null });
    request.flush(draftFixture({ state: 'mapped' }));
    await settle(fixture);
  });
});
