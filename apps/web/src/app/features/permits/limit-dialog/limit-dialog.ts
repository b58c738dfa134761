import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS, MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { describeLimit } from '@flueledger/calc';
import { firstValueFrom, map } from 'rxjs';

// A subpath import on purpose: through the package index this constant comes with the calc
// package's zod limit schemas (~450 kB) into this page, which only pre-fills one field with it.
import { IED_LCP_CONFIDENCE_INTERVAL_PERCENT } from '@flueledger/calc/confidence-interval';

import {
  AveragingPeriod,
  ExcludableStatus,
  Limit,
  LimitCriterion,
  LimitInput,
  LimitUnit,
  Pollutant,
  PermitsApi,
} from '../../../core/api/permits-api';
import { Basis, SiteDetail } from '../../../core/api/sites-api';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { datesInOrder } from '../../../shared/date-range';
import { fieldError } from '../../../shared/form-errors';
import { RecordEditor } from '../../../shared/record-editor';
import {
  basisLabels,
  limitUnits,
  limitUnitsWithoutO2,
  parameterLabels,
  periodLabels,
  periodsWithLength,
  pollutants,
  unitLabel,
} from '../../../shared/setup-labels';

export interface LimitDialogData {
  permitId: string;
  /** The permit's site: its regime pre-fills defaults, its stacks and units are the targets. */
  site: SiteDetail;
  permitEffectiveFrom: string;
  /** The limit to change; absent to add one. */
  limit?: Limit;
}

type CriterionType = LimitCriterion['type'];

/** Adds or changes one emission limit of a permit; closes with the saved limit. */
@Component({
  selector: 'fl-limit-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatButtonModule,
    ConflictNotice,
  ],
  providers: [
    RecordEditor,
    // Several hints here run to two or three lines (the IED defaults they quote): below a field
    // they take the room they need instead of running over the next field.
    { provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { appearance: 'outline', subscriptSizing: 'dynamic' } },
  ],
  templateUrl: './limit-dialog.html',
  styleUrl: './limit-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LimitDialog {
  private readonly api = inject(PermitsApi);
  private readonly dialogRef = inject<MatDialogRef<LimitDialog, Limit>>(MatDialogRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly editor = inject(RecordEditor);
  protected readonly data = inject<LimitDialogData>(MAT_DIALOG_DATA);

  protected readonly pollutants = pollutants;
  protected readonly parameterLabels = parameterLabels;
  protected readonly limitUnits = limitUnits;
  protected readonly unitLabel = unitLabel;
  protected readonly basisOptions = Object.keys(basisLabels) as Basis[];
  protected readonly basisLabels = basisLabels;
  protected readonly periods = Object.keys(periodLabels) as AveragingPeriod[];
  protected readonly periodLabels = periodLabels;
  protected readonly fieldError = fieldError;

  /** Stacks first, then emission units; the value says which kind. */
  protected readonly targets = [
    ...this.data.site.stacks.map((stack) => ({ value: `stack:${stack.id}`, label: `Stack: ${stack.name}` })),
    ...this.data.site.units.map((unit) => ({ value: `unit:${unit.id}`, label: `Emission unit: ${unit.name}` })),
  ];

  private readonly limit = this.data.limit;
  private readonly isEu = this.data.site.regime === 'eu_ied';

  protected readonly form = this.fb.group(
    {
      target: this.fb.control(this.initialTarget(), Validators.required),
      pollutant: this.fb.control<Pollutant>(this.limit?.pollutant ?? 'NOx', Validators.required),
      elv: this.fb.control<number | null>(this.limit?.elv ?? null, [Validators.required, Validators.min(0.000001)]),
      unit: this.fb.control<LimitUnit>(this.limit?.unit ?? (this.data.site.regime === 'us_epa' ? 'lb/MMBtu' : 'mg/Nm3'), Validators.required),
      referenceO2Percent: this.fb.control<number | null>(this.limit?.referenceO2Percent ?? null, [
        Validators.min(0),
        Validators.max(20.8),
      ]),
      ambientO2Percent: this.fb.control<21 | 20.9>(
        (this.limit?.ambientO2Percent as 21 | 20.9 | undefined) ?? (this.data.site.regime === 'us_epa' ? 20.9 : 21),
      ),
      basis: this.fb.control<Basis>(this.limit?.basis ?? 'dry'),
      period: this.fb.control<AveragingPeriod>(this.limit?.period ?? 'day', Validators.required),
      periodLength: this.fb.control<number | null>(this.limit?.periodLength ?? null, [Validators.min(1), Validators.max(8784)]),
      operatingPeriodsOnly: this.fb.control(this.limit?.operatingPeriodsOnly ?? true),
      criterionType: this.fb.control<CriterionType>(this.limit?.criterion.type ?? 'every_period'),
      criterionFactorPercent: this.fb.control<number | null>(
        this.limit ? Number((this.limit.criterion.factor * 100).toPrecision(6)) : 100,
        [Validators.required, Validators.min(1), Validators.max(1000)],
      ),
      criterionSharePercent: this.fb.control<number | null>(
        this.limit?.criterion.type === 'share_of_periods' ? Number((this.limit.criterion.share * 100).toPrecision(6)) : 95,
        [Validators.required, Validators.min(0.1), Validators.max(100)],
      ),
      confidenceIntervalPercent: this.fb.control<number | null>(this.limit?.confidenceIntervalPercent ?? null, [
        Validators.min(0),
        Validators.max(99.9),
      ]),
      nearMissPercent: this.fb.control<number | null>(this.limit?.nearMissPercent ?? 90, [
        Validators.required,
        Validators.min(1),
        Validators.max(99.9),
      ]),
      correctOnlyWhenAbove: this.fb.control(this.limit?.correctOnlyWhenAbove ?? false),
      excludeStartupShutdown: this.fb.control(this.limit ? this.limit.excludeStatuses.includes('startup-shutdown') : true),
      minValidHoursPerDay: this.fb.control<number | null>(this.limit?.minValidHoursPerDay ?? null, [Validators.min(1), Validators.max(24)]),
      effectiveFrom: this.fb.control(this.limit?.effectiveFrom ?? this.data.permitEffectiveFrom, Validators.required),
      effectiveTo: this.fb.control(this.limit?.effectiveTo ?? ''),
    },
    { validators: datesInOrder('effectiveFrom', 'effectiveTo', 'Must not be before the effective-from date') },
  );

  private readonly value = toSignal(this.form.valueChanges.pipe(map(() => this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  protected readonly unitText = computed(() => unitLabel(this.value().unit));
  protected readonly withO2 = computed(() => !limitUnitsWithoutO2.includes(this.value().unit));
  protected readonly withLength = computed(() => periodsWithLength.includes(this.value().period));
  protected readonly lengthUnit = computed(() => (this.value().period === 'rolling_days' ? 'days' : 'hours'));
  protected readonly withShare = computed(() => this.value().criterionType === 'share_of_periods');
  protected readonly defaultsSource = signal<string | null>(null);

  /** The sentence the API will store, as the person types; null while a number is missing. */
  protected readonly summary = computed(() => {
    const v = this.value();
    if (v.elv === null || v.criterionFactorPercent === null) return null;
    if (v.criterionType === 'share_of_periods' && v.criterionSharePercent === null) return null;
    return describeLimit({ ...this.body(v), pollutant: v.pollutant });
  });

  constructor() {
    this.syncEnabled();
    this.form.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.syncEnabled());
    if (!this.limit) {
      this.form.controls.target.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => void this.prefillDefaults());
      this.form.controls.pollutant.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.prefillConfidenceInterval());
      this.prefillConfidenceInterval();
      void this.prefillDefaults();
    }
  }

  private initialTarget(): string {
    if (this.limit) return this.limit.stackId ? `stack:${this.limit.stackId}` : `unit:${this.limit.unitId}`;
    const stack = this.data.site.stacks[0];
    const unit = this.data.site.units[0];
    return stack ? `stack:${stack.id}` : unit ? `unit:${unit.id}` : '';
  }

  /** Fields that do not apply are disabled, so they neither validate nor save. */
  private syncEnabled(): void {
    const c = this.form.controls;
    const toggle = (control: { enable: (o: object) => void; disable: (o: object) => void; enabled: boolean }, on: boolean) => {
      if (on && !control.enabled) control.enable({ emitEvent: false });
      if (!on && control.enabled) control.disable({ emitEvent: false });
    };
    const withO2 = !limitUnitsWithoutO2.includes(c.unit.value);
    toggle(c.referenceO2Percent, withO2);
    toggle(c.correctOnlyWhenAbove, withO2);
    toggle(c.periodLength, periodsWithLength.includes(c.period.value));
    toggle(c.operatingPeriodsOnly, c.period.value === 'rolling_days' || c.period.value === 'rolling_hours');
    toggle(c.criterionSharePercent, c.criterionType.value === 'share_of_periods');
    if (this.limit) toggle(c.target, false);
  }

  /** The emission unit behind a target, for the regime defaults: a stack's first unit. */
  private unitOfTarget(target: string) {
    const [kind, id] = target.split(':');
    const site = this.data.site;
    const unitId = kind === 'unit' ? id : site.stacks.find((stack) => stack.id === id)?.unitIds[0];
    return site.units.find((unit) => unit.id === unitId);
  }

  /** Reference and ambient O2 of the site's regime for the target's unit type and fuel (always editable). */
  private async prefillDefaults(): Promise<void> {
    const unit = this.unitOfTarget(this.form.controls.target.value);
    const fuel = this.data.site.fuels.find((candidate) => unit?.fuelIds.includes(candidate.id));
    try {
      const defaults = await firstValueFrom(
        this.api.limitDefaults({ regime: this.data.site.regime, unitType: unit?.unitType, fuelKind: fuel?.kind }),
      );
      const c = this.form.controls;
      if (!c.referenceO2Percent.dirty && defaults.referenceO2Percent !== null) {
        c.referenceO2Percent.setValue(defaults.referenceO2Percent);
      }
      if (!c.ambientO2Percent.dirty && (defaults.ambientO2Percent === 21 || defaults.ambientO2Percent === 20.9)) {
        c.ambientO2Percent.setValue(defaults.ambientO2Percent);
      }
      this.defaultsSource.set(defaults.source);
    } catch {
      this.defaultsSource.set(null);
    }
  }

  /** IED Annex V Part 3 point 9 confidence intervals, for EU sites, until the person types their own. */
  private prefillConfidenceInterval(): void {
    const control = this.form.controls.confidenceIntervalPercent;
    if (!this.isEu || control.dirty) return;
    const ci = (IED_LCP_CONFIDENCE_INTERVAL_PERCENT as Partial<Record<Pollutant, number>>)[this.form.controls.pollutant.value];
    control.setValue(ci ?? null);
  }

  private body(v: ReturnType<LimitDialog['form']['getRawValue']>): Omit<LimitInput, 'stackId' | 'unitId'> {
    const withO2 = !limitUnitsWithoutO2.includes(v.unit);
    const factor = (v.criterionFactorPercent ?? 100) / 100;
    const criterion: LimitCriterion =
      v.criterionType === 'share_of_periods'
        ? { type: 'share_of_periods', factor, share: (v.criterionSharePercent ?? 95) / 100 }
        : { type: 'every_period', factor };
    const keptStatuses = (this.limit?.excludeStatuses ?? []).filter((s) => s !== 'startup-shutdown') as ExcludableStatus[];
    return {
      pollutant: v.pollutant,
      elv: v.elv ?? 0,
      unit: v.unit,
      referenceO2Percent: withO2 ? v.referenceO2Percent : null,
      ambientO2Percent: v.ambientO2Percent,
      basis: v.basis,
      period: v.period,
      periodLength: periodsWithLength.includes(v.period) ? v.periodLength : null,
      operatingPeriodsOnly: v.operatingPeriodsOnly,
      criterion,
      confidenceIntervalPercent: v.confidenceIntervalPercent,
      nearMissPercent: v.nearMissPercent ?? 90,
      correctOnlyWhenAbove: withO2 && v.correctOnlyWhenAbove,
      excludeStatuses: v.excludeStartupShutdown ? ['startup-shutdown', ...keptStatuses] : keptStatuses,
      minValidHoursPerDay: v.minValidHoursPerDay,
      effectiveFrom: v.effectiveFrom,
      effectiveTo: v.effectiveTo || null,
    };
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body = this.body(value);
      let saved: Limit;
      if (this.limit) {
        saved = await firstValueFrom(this.api.updateLimit(this.limit.id, { ...body, version: this.limit.version }));
      } else {
        const [kind, id] = value.target.split(':');
        saved = await firstValueFrom(
          this.api.createLimit(this.data.permitId, { ...body, stackId: kind === 'stack' ? id : null, unitId: kind === 'unit' ? id : null }),
        );
      }
      this.dialogRef.close(saved);
    });
  }

  protected reload(): void {
    this.dialogRef.close(undefined);
  }
}
