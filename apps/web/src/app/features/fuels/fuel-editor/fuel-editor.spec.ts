import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';

import { Role } from '../../../core/api/auth-api';
import { authAs, gasFuel, settle, siteDetail } from '../../sites/testing/setup-fixtures';
import { FuelEditor } from './fuel-editor';

// Harness-driven tests on a shared 2-core machine: the first one also compiles the templates.
jest.setTimeout(30_000);

describe('FuelEditor', () => {
  let fixture: ComponentFixture<FuelEditor>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  async function open(role: Role, fuelId?: string): Promise<void> {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), authAs(role)],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FuelEditor);
    fixture.componentRef.setInput('siteId', 'site-1');
    if (fuelId) fixture.componentRef.setInput('fuelId', fuelId);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush(siteDetail());
    if (fuelId) {
      http.expectOne(`/api/fuels/${fuelId}`).flush(gasFuel);
      http.expectOne((req) => req.url === `/api/fuels/${fuelId}/analyses`).flush({ items: [gasFuel.currentAnalysis], total: 1 });
    }
    await settle(fixture);
  }

  afterEach(() => http.verify());

  async function field(label: string): Promise<MatInputHarness> {
    const formField = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await formField.getControl(MatInputHarness))!;
  }

  /** The live panel as label → "value unit" and label → how it was obtained. */
  async function panel(): Promise<{ values: Map<string, string>; how: Map<string, string> }> {
    const table = await loader.getHarness(MatTableHarness.with({ selector: '[aria-label="Combustion figures"]' }));
    const rows = await table.getRows();
    const values = new Map<string, string>();
    const how = new Map<string, string>();
    for (const row of rows) {
      const cells = await row.getCellTextByColumnName();
      values.set(cells['label'], cells['value']);
      how.set(cells['label'], cells['how']);
    }
    return { values, how };
  }

  const number = (text: string | undefined): number => Number((text ?? '').replace(/,/g, '').split(' ')[0]);

  describe('live calculation panel', () => {
    it('computes pure methane from its composition and names how', async () => {
      await open('officer');
      await (await field('Methane CH4')).setValue('100');
      await settle(fixture);

      const { values, how } = await panel();
      // Pure methane, xO2 = 0.21: 2/0.21 = 9.524 Nm3/Nm3 [derived, REFERENCES.md §1].
      expect(number(values.get('Stoichiometric air'))).toBeCloseTo(9.524, 2);
      expect(values.get('Stoichiometric air')).toContain('Nm3 air/Nm3 fuel');
      // Dry flue gas 8.524, wet 10.524, CO2max 11.73 % dry [derived, REFERENCES.md §1].
      expect(number(values.get('Dry flue gas, stoichiometric'))).toBeCloseTo(8.524, 2);
      expect(number(values.get('Wet flue gas, stoichiometric'))).toBeCloseTo(10.524, 2);
      expect(number(values.get('CO2max'))).toBeCloseTo(11.73, 1);
      // Methane HHV 55.5 MJ/kg ÷ 1.39 … → 39.7 MJ/Nm3 (ISO 6976 890.63 kJ/mol ÷ 22.414) [memory].
      expect(number(values.get('Gross calorific value (GCV, HHV)'))).toBeCloseTo(39.74, 1);
      expect(how.get('Gross calorific value (GCV, HHV)')).toContain('ISO 6976');
      expect(how.get('Fd, dry F-factor')).toContain('EPA Method 19');
      // Complete combustion, no dissociation: ≈ 2326 K [derived, REFERENCES.md §6], ±5 K.
      expect(Math.abs(number(values.get('Adiabatic flame temperature, complete combustion')) - 2326)).toBeLessThanOrEqual(5);
      expect((fixture.nativeElement as HTMLElement).textContent).toContain('do not replace');
    });

    it('updates as the analysis changes', async () => {
      await open('officer');
      await (await field('Methane CH4')).setValue('100');
      await settle(fixture);
      expect(number((await panel()).values.get('Stoichiometric air'))).toBeCloseTo(9.524, 2);

      await (await field('Methane CH4')).setValue('90');
      await (await field('Ethane C2H6')).setValue('10');
      await settle(fixture);
      // O2 demand per mole: CH4 2, C2H6 3.5 (REFERENCES.md §1) → (0.9·2 + 0.1·3.5)/0.21 = 10.238.
      expect(number((await panel()).values.get('Stoichiometric air'))).toBeCloseTo(10.238, 2);
    });

    it('shows the air ratio at the flue-gas O2 chosen for the panel', async () => {
      await open('officer');
      await (await field('Methane CH4')).setValue('100');
      await (await field('Flue-gas O2 for the figures below')).setValue('3');
      await settle(fixture);
      // λ = 1 + (8.524/9.524)·3/(21 − 3) = 1.149 (REFERENCES.md §1 formula, xO2 0.21).
      expect(number((await panel()).values.get('Air ratio λ at 3 % O2 dry'))).toBeCloseTo(1.149, 2);
    });

    it('shows the Method 19 Table 19-2 default when chosen', async () => {
      await open('officer');
      await (await field('Methane CH4')).setValue('100');
      const source = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="fFactorSource"]' }));
      await source.clickOptions({ text: 'Method 19 Table 19-2 default' });
      await settle(fixture);

      const { values, how } = await panel();
      // Natural gas Fd 8710 dscf/MMBtu, Fc 1040 scf/MMBtu [pub, 40 CFR 60 App. A Method 19 Table 19-2].
      expect(number(values.get('Fd, dry F-factor'))).toBe(8710);
      expect(number(values.get('Fc, carbon F-factor'))).toBe(1040);
      expect(how.get('Fd, dry F-factor')).toContain('Method 19 Table 19-2 default');
    });

    it('says so when the composition does not sum to 100 %', async () => {
      await open('officer');
      await (await field('Methane CH4')).setValue('90');
      await settle(fixture);

      const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
      expect(text).toContain('The gas composition sums to 90.00 mol %');
      expect(await loader.getAllHarnesses(MatTableHarness.with({ selector: '[aria-label="Combustion figures"]' }))).toHaveLength(0);
    });

    it('asks for the ultimate analysis of a solid fuel', async () => {
      await open('officer');
      const type = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="fuelType"]' }));
      await type.clickOptions({ text: 'Bituminous coal' });
      await settle(fixture);
      expect((fixture.nativeElement as HTMLElement).textContent).toContain('Enter the ultimate analysis');
      expect(await loader.getAllHarnesses(MatFormFieldHarness.with({ floatingLabelText: 'Methane CH4' }))).toHaveLength(0);
    });
  });

  describe('saving', () => {
    it('creates the fuel with its first analysis', async () => {
      await open('officer');
      await (await field('Name')).setValue('Pipeline gas');
      await (await field('Methane CH4')).setValue('95');
      await (await field('Nitrogen N2')).setValue('5');
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Create fuel' }))).click();
      await settle(fixture);

      const request = http.expectOne('/api/sites/site-1/fuels');
      expect(request.request.method).toBe('POST');
      expect(request.request.body).toEqual({
        name: 'Pipeline gas',
        fuelType: 'natural_gas',
        analysis: expect.objectContaining({ composition: { CH4: 95, N2: 5 }, gcvMJPerNm3: null, fFactorSource: 'computed' }),
      });
      request.flush({ ...gasFuel, name: 'Pipeline gas' });
      await settle(fixture);
    });

    it('refuses to save a composition that does not sum to 100 %', async () => {
      await open('officer');
      await (await field('Name')).setValue('Pipeline gas');
      await (await field('Methane CH4')).setValue('80');
      await (await loader.getHarness(MatButtonHarness.with({ text: 'Create fuel' }))).click();
      await settle(fixture);
      http.expectNone('/api/sites/site-1/fuels');
      expect((fixture.nativeElement as HTMLElement).textContent).toContain('it must be 100 ± 0.5 mol %');
    });
  });

  describe('for an auditor', () => {
    it('shows the fuel and its figures without edit controls', async () => {
      await open('auditor', 'fuel-gas');

      // The only buttons left are the history table's page buttons.
      expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /Save|Create|Archive/ }))).toHaveLength(0);
      const labels = await Promise.all((await loader.getAllHarnesses(MatButtonHarness)).map(async (b) => (await b.host()).getAttribute('aria-label')));
      expect(labels.every((label) => /page/i.test(label ?? ''))).toBe(true);
      expect(await loader.getAllHarnesses(MatFormFieldHarness.with({ floatingLabelText: 'Name' }))).toHaveLength(0);
      // The panel still computes from the stored analysis (pure methane → 9.524 Nm3/Nm3).
      expect(number((await panel()).values.get('Stoichiometric air'))).toBeCloseTo(9.524, 2);
    });
  });
});
