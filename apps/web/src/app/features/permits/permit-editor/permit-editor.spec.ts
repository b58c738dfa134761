import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';

import { Role } from '../../../core/api/auth-api';
import { Limit, PermitDetail } from '../../../core/api/permits-api';
import { authAs, settle, siteDetail } from '../../sites/testing/setup-fixtures';
import { PermitEditor, permitFileProblem } from './permit-editor';

const stamp = { archivedAt: null, version: 1, createdAt: '2026-11-02T08:00:00Z', updatedAt: '2026-11-02T08:00:00Z' };

const dailyNox: Limit = {
  ...stamp,
  id: 'limit-1',
  permitId: 'permit-1',
  stackId: 'stack-1',
  unitId: null,
  pollutant: 'NOx',
  elv: 100,
  unit: 'mg/Nm3',
  referenceO2Percent: 3,
  ambientO2Percent: 21,
  basis: 'dry',
  period: 'day',
  periodLength: null,
  operatingPeriodsOnly: true,
  criterion: { type: 'every_period', factor: 1.1 },
  confidenceIntervalPercent: 20,
  nearMissPercent: 90,
  correctOnlyWhenAbove: false,
  excludeStatuses: ['startup-shutdown'],
  minValidHoursPerDay: null,
  minData: null,
  effectiveFrom: '2026-01-01',
  effectiveTo: null,
  // As the API writes it (the set-up contract's example sentence).
  summary: 'NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV',
};

function permit(limits: Limit[] = []): PermitDetail {
  return {
    ...stamp,
    id: 'permit-1',
    siteId: 'site-1',
    reference: 'HM-2026-014',
    authority: 'Invented District Environment Office',
    effectiveFrom: '2026-01-01',
    effectiveTo: null,
    document: null,
    limits,
  };
}

// Harness-driven tests on a shared 2-core machine: the first one also compiles the templates.
jest.setTimeout(30_000);

describe('PermitEditor', () => {
  let fixture: ComponentFixture<PermitEditor>;
  let loader: HarnessLoader;
  let documentLoader: HarnessLoader;
  let http: HttpTestingController;

  async function open(role: Role, limits: Limit[] = []): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        authAs(role),
        // jsdom fires no animation events: a dialog would never finish closing.
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PermitEditor);
    fixture.componentRef.setInput('siteId', 'site-1');
    fixture.componentRef.setInput('permitId', 'permit-1');
    loader = TestbedHarnessEnvironment.loader(fixture);
    documentLoader = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush(siteDetail());
    http.expectOne('/api/permits/permit-1').flush(permit(limits));
    await settle(fixture);
  }

  afterEach(() => http.verify());

  async function dialogField(dialog: MatDialogHarness, label: string): Promise<MatInputHarness> {
    const formField = await dialog.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await formField.getControl(MatInputHarness))!;
  }

  async function limitRows(): Promise<Record<string, string>[]> {
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[aria-labelledby="limits-heading"]' }));
    return Promise.all((await table.getRows()).map((row) => row.getCellTextByColumnName()));
  }

  it('adds a daily NOx limit with the regime default reference O2 and shows it in words', async () => {
    await open('officer');
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No limits yet.');

    await (await loader.getHarness(MatButtonHarness.with({ text: /Add limit/ }))).click();
    await settle(fixture);
    // The stack's boiler burns a gas: the EU default asked for is the IED's 3 % for gas.
    const defaults = http.expectOne((req) => req.url === '/api/limit-defaults');
    expect(defaults.request.params.get('regime')).toBe('eu_ied');
    expect(defaults.request.params.get('unitType')).toBe('boiler');
    expect(defaults.request.params.get('fuelKind')).toBe('gas');
    defaults.flush({ referenceO2Percent: 3, ambientO2Percent: 21, source: 'IED 2010/75/EU Annex V Part 1' });
    await settle(fixture);

    const dialog = await documentLoader.getHarness(MatDialogHarness);
    expect(await (await dialogField(dialog, 'Reference O2')).getValue()).toBe('3');
    // The dialog's long hints (the IED defaults they quote) take the lines they need below their
    // field instead of running over the next one.
    const fields = document.querySelectorAll('mat-dialog-container mat-form-field');
    expect(fields.length).toBeGreaterThan(5);
    expect(document.querySelectorAll('mat-dialog-container .mat-mdc-form-field-subscript-dynamic-size')).toHaveLength(fields.length);
    // IED Annex V Part 3 point 9: NOx confidence interval 20 % of the ELV.
    expect(await (await dialogField(dialog, 'Confidence interval')).getValue()).toBe('20');

    await (await dialogField(dialog, 'Emission limit value')).setValue('100');
    await (await dialog.getHarness(MatSelectHarness.with({ selector: '[formControlName="period"]' }))).clickOptions({
      text: 'Daily average',
    });
    await (await dialogField(dialog, 'Threshold')).setValue('110');
    await settle(fixture);
    const dialogText = await (await dialog.host()).text();
    expect(dialogText).toContain('Reads as:');
    expect(dialogText).toContain('NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV');

    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save limit' }))).click();
    await settle(fixture);
    const created = http.expectOne('/api/permits/permit-1/limits');
    expect(created.request.method).toBe('POST');
    expect(created.request.body).toEqual(
      expect.objectContaining({
        stackId: 'stack-1',
        unitId: null,
        pollutant: 'NOx',
        elv: 100,
        unit: 'mg/Nm3',
        referenceO2Percent: 3,
        ambientO2Percent: 21,
        period: 'day',
        criterion: { type: 'every_period', factor: 1.1 },
        confidenceIntervalPercent: 20,
      }),
    );
    created.flush(dailyNox);
    await settle(fixture, 50);

    const rows = await limitRows();
    expect(rows).toHaveLength(1);
    expect(rows[0]['target']).toBe('Stack: Main stack');
    expect(rows[0]['summary']).toBe(dailyNox.summary);
  });

  it('changes a limit with its version and shows the new summary', async () => {
    await open('officer', [dailyNox]);

    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label^="Edit limit"]' }))).click();
    await settle(fixture);
    const dialog = await documentLoader.getHarness(MatDialogHarness);
    await (await dialogField(dialog, 'Emission limit value')).setValue('80');
    await settle(fixture);
    expect(await (await dialog.host()).text()).toContain('NOx ≤ 80 mg/Nm3, dry, 3 % O2, daily average');

    await (await dialog.getHarness(MatButtonHarness.with({ text: 'Save limit' }))).click();
    await settle(fixture);
    const update = http.expectOne('/api/limits/limit-1');
    expect(update.request.method).toBe('PATCH');
    expect(update.request.body).toEqual(expect.objectContaining({ elv: 80, version: 1 }));
    expect(update.request.body).not.toHaveProperty('stackId');
    const summary = 'NOx ≤ 80 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV';
    update.flush({ ...dailyNox, elv: 80, version: 2, summary });
    await settle(fixture, 50);

    const rows = await limitRows();
    expect(rows[0]['elv']).toBe('80 mg/Nm3');
    expect(rows[0]['summary']).toBe(summary);
  });

  it('offers a reload when someone else changed the permit first', async () => {
    await open('officer');
    const reference = await (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Reference' }))).getControl(MatInputHarness);
    await reference!.setValue('HM-2026-014a');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save permit' }))).click();
    await settle(fixture);
    const update = http.expectOne('/api/permits/permit-1');
    expect(update.request.body).toEqual(expect.objectContaining({ reference: 'HM-2026-014a', version: 1 }));
    update.flush(
      { error: { code: 'stale_version', message: 'The permit was changed by someone else.' } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle(fixture);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Someone else changed this permit');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Reload' }))).click();
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush(siteDetail());
    http.expectOne('/api/permits/permit-1').flush({ ...permit(), reference: 'HM-2026-015', version: 2 });
    await settle(fixture);
    const reloaded = await (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Reference' }))).getControl(MatInputHarness);
    expect(await reloaded!.getValue()).toBe('HM-2026-015');
    expect((fixture.nativeElement as HTMLElement).textContent).not.toContain('Someone else changed this permit');
  });

  it('shows an auditor the limits with no edit controls', async () => {
    await open('auditor', [dailyNox]);

    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Add limit|Save|Archive|Upload|Replace/ }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Edit limit"]' }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatFormFieldHarness.with({ floatingLabelText: 'Reference' }))).toHaveLength(0);
    const rows = await limitRows();
    expect(rows[0]['summary']).toBe(dailyNox.summary);
    expect(Object.keys(rows[0])).not.toContain('actions');
  });
});

describe('permitFileProblem', () => {
  it('accepts a PDF and refuses other files and files over 20 MB', () => {
    expect(permitFileProblem(new File(['%PDF-1.7'], 'permit.pdf', { type: 'application/pdf' }))).toBeNull();
    expect(permitFileProblem(new File(['hello'], 'permit.docx', { type: 'application/msword' }))).toContain('is not a PDF');
    const big = new File(['%PDF-'], 'big.pdf', { type: 'application/pdf' });
    Object.defineProperty(big, 'size', { value: 21 * 1024 * 1024 });
    expect(permitFileProblem(big)).toContain('at most 20 MB');
  });
});
