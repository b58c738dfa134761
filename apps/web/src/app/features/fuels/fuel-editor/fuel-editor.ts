import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import {
  AbstractControl,
  FormControl,
  NonNullableFormBuilder,
  ReactiveFormsModule,
  ValidationErrors,
  Validators,
} from '@angular/forms';
import type { GasComponent, UltimateAnalysis } from '@flueledger/calc';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { debounceTime, firstValueFrom, map } from 'rxjs';

import {
  AnalysisInput,
  FFactorSource,
  Fuel,
  FuelAnalysis,
  FuelsApi,
  FuelType,
  GasCompositionInput,
  UltimateAnalysisInput,
} from '../../../core/api/fuels-api';
import { SiteDetail, SitesApi } from '../../../core/api/sites-api';
import { CalcCaution } from '../../../shared/calc-caution';
import { ClientTable } from '../../../shared/client-table';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { FormActions } from '../../../shared/form-actions';
import { fieldError } from '../../../shared/form-errors';
import { formatNumber } from '../../../shared/format-number';
import { LoadState } from '../../../shared/load-state';
import { PageHeader } from '../../../shared/page-header';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import { RecordEditor } from '../../../shared/record-editor';
import { TablePager } from '../../../shared/table-pager';
import { fFactorSourceLabels, fuelKindLabels, fuelTypeLabels, kindOfFuelType } from '../../../shared/setup-labels';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';
import {
  equilibriumFlame,
  fuelPreview,
  gasComponentLabels,
  gasComponents,
  method19DefaultOf,
  ultimateKeys,
  ultimateLabels,
} from './fuel-preview';

/** The sum rule of the calc package and the API: 100 ± 0.5 percentage points. */
const SUM_TOLERANCE_PERCENT = 0.5;

function sumsTo100(unit: string, what: string) {
  return (group: AbstractControl): ValidationErrors | null => {
    const values = Object.values(group.value as Record<string, number | null>).filter(
      (value): value is number => typeof value === 'number' && Number.isFinite(value),
    );
    if (values.length === 0) return { sum: `Enter the ${what}; it must sum to 100 ${unit}.` };
    const sum = values.reduce((a, b) => a + b, 0);
    if (Math.abs(sum - 100) <= SUM_TOLERANCE_PERCENT) return null;
    return { sum: `The ${what} sums to ${sum.toFixed(2)} ${unit}; it must be 100 ± ${SUM_TOLERANCE_PERCENT} ${unit}.` };
  };
}

const percentValidators = [Validators.min(0), Validators.max(100)];

function today(): string {
  const now = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

interface AnalysisRow {
  id: string;
  validFrom: string;
  gcv: number | null;
  fd: number;
  fc: number;
  source: string;
}

/**
 * A fuel, its analysis and the live calculation panel: stoichiometric air, flue-gas volumes,
 * CO2max, heating values, F-factors and flame temperatures from @flueledger/calc, each with its
 * unit and how it was obtained. Saving a changed analysis records a new one; history is kept.
 */
@Component({
  selector: 'fl-fuel-editor',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatIconModule,
    MatTableModule,
    MatSortModule,
    CalcCaution,
    ConflictNotice,
    FormActions,
    LoadState,
    PageHeader,
    ReadOnlyFields,
    TablePager,
  ],
  providers: [RecordEditor],
  templateUrl: './fuel-editor.html',
  styleUrl: './fuel-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class FuelEditor implements HasUnsavedChanges {
  private readonly fuelsApi = inject(FuelsApi);
  private readonly sitesApi = inject(SitesApi);
  private readonly router = inject(Router);
  protected readonly editor = inject(RecordEditor);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly siteId = input.required<string>();
  /** Absent on …/fuels/new. */
  readonly fuelId = input<string>();

  protected readonly fuelTypes = Object.keys(fuelTypeLabels) as FuelType[];
  protected readonly fuelTypeLabels = fuelTypeLabels;
  protected readonly fFactorSources = Object.keys(fFactorSourceLabels) as FFactorSource[];
  protected readonly fFactorSourceLabels = fFactorSourceLabels;
  protected readonly gasComponents = gasComponents;
  protected readonly gasComponentLabels = gasComponentLabels;
  protected readonly ultimateKeys = ultimateKeys;
  protected readonly ultimateLabels = ultimateLabels;
  protected readonly fieldError = fieldError;

  protected readonly form = this.fb.group({
    name: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
    fuelType: this.fb.control<FuelType>('natural_gas', Validators.required),
    analysis: this.fb.group({
      validFrom: this.fb.control(today(), Validators.required),
      composition: this.fb.group(
        Object.fromEntries(gasComponents.map((c) => [c, this.fb.control<number | null>(null, percentValidators)])) as Record<
          GasComponent,
          FormControl<number | null>
        >,
        { validators: sumsTo100('mol %', 'gas composition') },
      ),
      ultimate: this.fb.group(
        Object.fromEntries(ultimateKeys.map((k) => [k, this.fb.control<number | null>(null, percentValidators)])) as Record<
          keyof UltimateAnalysis,
          FormControl<number | null>
        >,
        { validators: sumsTo100('%', 'ultimate analysis') },
      ),
      gcv: this.fb.control<number | null>(null, [Validators.min(0.001), Validators.max(200)]),
      fFactorSource: this.fb.control<FFactorSource>('computed'),
    }),
  });
  /** Only for the panel: not saved with the fuel. */
  protected readonly previewO2 = new FormControl<number | null>(3, [Validators.min(0), Validators.max(20.9)]);

  protected readonly site = signal<SiteDetail | null>(null);
  protected readonly fuel = signal<Fuel | null>(null);
  private readonly analyses = signal<FuelAnalysis[]>([]);

  private readonly formValue = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  private readonly previewO2Value = toSignal(this.previewO2.valueChanges, { initialValue: this.previewO2.value });

  protected readonly kind = computed(() => kindOfFuelType[this.formValue().fuelType]);
  protected readonly kindLabel = computed(() => fuelKindLabels[this.kind()]);
  protected readonly gcvUnit = computed(() => (this.kind() === 'gas' ? 'MJ/Nm3' : 'MJ/kg'));
  protected readonly hasMethod19Default = computed(() => method19DefaultOf[this.formValue().fuelType] !== undefined);

  protected readonly preview = computed(() => {
    const value = this.formValue();
    const o2 = this.previewO2Value();
    return fuelPreview({
      fuelType: value.fuelType,
      composition: value.analysis.composition,
      ultimate: value.analysis.ultimate,
      gcv: value.analysis.gcv,
      fFactorSource: value.analysis.fFactorSource,
      o2PercentDry: this.previewO2.valid ? o2 : null,
    });
  });
  protected readonly previewColumns = ['label', 'value', 'how'];

  private readonly calcFuel = computed(() => {
    const preview = this.preview();
    return preview.state === 'ok' ? preview.fuel : null;
  });
  // The equilibrium solver is the heavy one: run it once the analysis stops changing.
  private readonly equilibriumResult = toSignal(
    toObservable(this.calcFuel).pipe(
      debounceTime(400),
      map((fuel) => (fuel ? { fuel, result: equilibriumFlame(fuel) } : null)),
    ),
    { initialValue: null },
  );
  protected readonly equilibrium = computed(() => {
    const latest = this.equilibriumResult();
    const fuel = this.calcFuel();
    if (!fuel) return { state: 'none' as const };
    if (!latest || latest.fuel !== fuel) return { state: 'pending' as const };
    return 'error' in latest.result
      ? { state: 'error' as const, message: latest.result.error }
      : { state: 'ok' as const, temperatureK: latest.result.temperatureK, how: latest.result.how };
  });

  protected readonly compositionError = computed(() => {
    this.formValue();
    const group = this.kind() === 'gas' ? this.form.controls.analysis.controls.composition : this.form.controls.analysis.controls.ultimate;
    return (group.errors?.['sum'] as string | undefined) ?? null;
  });
  protected readonly showCompositionError = signal(false);

  protected readonly readOnlyFields = computed<ReadOnlyField[]>(() => {
    const fuel = this.fuel();
    if (!fuel) return [];
    const analysis = fuel.currentAnalysis;
    const fields: ReadOnlyField[] = [
      { label: 'Fuel type', value: `${fuelTypeLabels[fuel.fuelType]} (${fuelKindLabels[fuel.kind]})` },
      { label: 'Analysis valid from', value: analysis?.validFrom ?? 'No analysis recorded' },
    ];
    if (!analysis) return fields;
    const gcv = analysis.gcvMJPerNm3 ?? analysis.gcvMJPerKg;
    // A calculated GCV arrives at full double precision: show it as people read it, and say
    // that it was calculated rather than measured.
    const gcvText = `${formatNumber(gcv, 3)} ${fuel.kind === 'gas' ? 'MJ/Nm3' : 'MJ/kg'}`;
    fields.push({
      label: 'Gross calorific value',
      value: gcv === null ? 'Not measured' : analysis.gcvSource === 'measured' ? gcvText : `${gcvText} (calculated from the analysis)`,
    });
    fields.push({ label: 'F-factors', value: fFactorSourceLabels[analysis.fFactorSource] });
    if (analysis.composition) {
      for (const component of gasComponents) {
        const value = analysis.composition[component];
        if (value !== undefined) fields.push({ label: gasComponentLabels[component], value: `${value} mol %` });
      }
    }
    if (analysis.ultimate) {
      for (const key of ultimateKeys) {
        const value = analysis.ultimate[key];
        if (value !== undefined) fields.push({ label: ultimateLabels[key], value: `${value} %` });
      }
    }
    return fields;
  });

  private readonly analysisRows = computed<AnalysisRow[]>(() =>
    this.analyses().map((analysis) => ({
      id: analysis.id,
      validFrom: analysis.validFrom,
      gcv: analysis.gcvMJPerNm3 ?? analysis.gcvMJPerKg,
      fd: analysis.fdDscfPerMMBtu,
      fc: analysis.fcScfPerMMBtu,
      source: fFactorSourceLabels[analysis.fFactorSource],
    })),
  );
  protected readonly history = new ClientTable<AnalysisRow>({
    rows: this.analysisRows,
    filter: signal(''),
    text: (row) => row.validFrom,
    sortValue: (row, column) => (row as unknown as Record<string, string | number | null>)[column] ?? null,
    initialSort: { active: 'validFrom', direction: 'desc' },
  });
  protected readonly historyColumns = ['validFrom', 'gcv', 'fd', 'fc', 'source'];

  constructor() {
    this.applyKind(this.form.controls.fuelType.value);
    this.form.controls.fuelType.valueChanges.pipe(takeUntilDestroyed()).subscribe((fuelType) => {
      this.applyKind(fuelType);
      // The usual reference O2 of the fuel's kind (IED Annex V Part 1): 6 % solid, 3 % liquid and gas.
      if (!this.previewO2.dirty) this.previewO2.setValue(kindOfFuelType[fuelType] === 'solid' ? 6 : 3);
      if (!method19DefaultOf[fuelType]) this.form.controls.analysis.controls.fFactorSource.setValue('computed');
    });
    effect(() => void this.load(this.siteId(), this.fuelId()));
  }

  /** Only the analysis of the fuel's kind is validated and saved. */
  private applyKind(fuelType: FuelType): void {
    const analysis = this.form.controls.analysis.controls;
    if (kindOfFuelType[fuelType] === 'gas') {
      analysis.composition.enable({ emitEvent: false });
      analysis.ultimate.disable({ emitEvent: false });
    } else {
      analysis.ultimate.enable({ emitEvent: false });
      analysis.composition.disable({ emitEvent: false });
    }
  }

  hasUnsavedChanges(): boolean {
    return this.editor.hasUnsavedChanges(this.form);
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected reload(): Promise<void> {
    return this.load(this.siteId(), this.fuelId());
  }

  private load(siteId: string, fuelId: string | undefined): Promise<void> {
    return this.editor.load(async () => {
      const [site, fuel, analyses] = await Promise.all([
        firstValueFrom(this.sitesApi.getSite(siteId)),
        fuelId ? firstValueFrom(this.fuelsApi.getFuel(fuelId)) : Promise.resolve(null),
        fuelId ? firstValueFrom(this.fuelsApi.listAnalyses(fuelId, { limit: 200 })) : Promise.resolve(null),
      ]);
      this.site.set(site);
      this.fuel.set(fuel);
      this.analyses.set(analyses?.items ?? []);
      if (fuel) this.fillFrom(fuel);
    });
  }

  private fillFrom(fuel: Fuel): void {
    const analysis = fuel.currentAnalysis;
    this.applyKind(fuel.fuelType);
    const composition = Object.fromEntries(gasComponents.map((c) => [c, analysis?.composition?.[c] ?? null]));
    const ultimate = Object.fromEntries(ultimateKeys.map((k) => [k, analysis?.ultimate?.[k] ?? null]));
    this.form.reset({
      name: fuel.name,
      fuelType: fuel.fuelType,
      analysis: {
        validFrom: analysis?.validFrom ?? today(),
        composition,
        ultimate,
        gcv: analysis ? (analysis.gcvSource === 'measured' ? (analysis.gcvMJPerNm3 ?? analysis.gcvMJPerKg) : null) : null,
        fFactorSource: analysis?.fFactorSource ?? 'computed',
      },
    });
    if (!this.previewO2.dirty) this.previewO2.setValue(fuel.kind === 'solid' ? 6 : 3);
  }

  private analysisBody(): AnalysisInput {
    const value = this.form.getRawValue();
    const analysis = value.analysis;
    const gas = kindOfFuelType[value.fuelType] === 'gas';
    const body: AnalysisInput = { validFrom: analysis.validFrom, fFactorSource: analysis.fFactorSource };
    if (gas) {
      const composition: GasCompositionInput = {};
      for (const component of gasComponents) {
        const amount = analysis.composition[component];
        if (amount !== null) composition[component] = amount;
      }
      body.composition = composition;
      body.gcvMJPerNm3 = analysis.gcv;
    } else {
      body.ultimate = Object.fromEntries(ultimateKeys.map((k) => [k, analysis.ultimate[k] ?? 0])) as UltimateAnalysisInput;
      body.gcvMJPerKg = analysis.gcv;
    }
    return body;
  }

  protected save(): Promise<void> {
    this.showCompositionError.set(true);
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const current = this.fuel();
      if (!current) {
        await firstValueFrom(
          this.fuelsApi.createFuel(this.siteId(), { name: value.name.trim(), fuelType: value.fuelType, analysis: this.analysisBody() }),
        );
        this.form.markAsPristine();
        this.editor.notify(`Fuel “${value.name.trim()}” added with its analysis.`);
        await this.router.navigate(['/sites', this.siteId()]);
        return;
      }
      const controls = this.form.controls;
      const analysisChanged = controls.analysis.dirty;
      if (controls.name.dirty || controls.fuelType.dirty) {
        await firstValueFrom(
          this.fuelsApi.updateFuel(current.id, { name: value.name.trim(), fuelType: value.fuelType, version: current.version }),
        );
      }
      if (analysisChanged) await firstValueFrom(this.fuelsApi.addAnalysis(current.id, this.analysisBody()));
      this.form.markAsPristine();
      this.editor.notify(analysisChanged ? 'Fuel saved with a new analysis.' : 'Fuel saved.');
      await this.load(this.siteId(), current.id);
    });
  }

  protected async archive(): Promise<void> {
    const fuel = this.fuel();
    if (!fuel) return;
    const message = `Fuel “${fuel.name}” archived. Its analyses are kept.`;
    await this.editor.archive(this.fuelsApi.archiveFuel(fuel.id, fuel.version), this.form, message, this.siteId());
  }

  protected onAnalysisInput(): void {
    this.showCompositionError.set(true);
  }
}
