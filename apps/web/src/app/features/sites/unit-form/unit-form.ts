import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { EmissionUnit, SiteDetail, SitesApi, UnitInput, UnitType } from '../../../core/api/sites-api';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { datesInOrder } from '../../../shared/date-range';
import { FormActions } from '../../../shared/form-actions';
import { fieldError } from '../../../shared/form-errors';
import { LoadState } from '../../../shared/load-state';
import { namesOf } from '../../../shared/names-of';
import { PageHeader } from '../../../shared/page-header';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import { RecordEditor } from '../../../shared/record-editor';
import { unitTypeLabels } from '../../../shared/setup-labels';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';

/** Adds or changes an emission unit; people without `site:write` see it read-only. */
@Component({
  selector: 'fl-unit-form',
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    ConflictNotice,
    FormActions,
    LoadState,
    PageHeader,
    ReadOnlyFields,
  ],
  providers: [RecordEditor],
  templateUrl: './unit-form.html',
  styleUrl: './unit-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class UnitForm implements HasUnsavedChanges {
  private readonly api = inject(SitesApi);
  private readonly router = inject(Router);
  protected readonly editor = inject(RecordEditor);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly siteId = input.required<string>();
  /** Absent on …/units/new. */
  readonly unitId = input<string>();

  protected readonly unitTypes = Object.keys(unitTypeLabels) as UnitType[];
  protected readonly unitTypeLabels = unitTypeLabels;
  protected readonly fieldError = fieldError;

  protected readonly form = this.fb.group(
    {
      name: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
      unitType: this.fb.control<UnitType>('boiler', Validators.required),
      ratedThermalInputMWth: this.fb.control<number | null>(null, [
        Validators.required,
        Validators.min(0.001),
        Validators.max(100000),
      ]),
      inServiceFrom: this.fb.control('', Validators.required),
      inServiceTo: this.fb.control(''),
      fuelIds: this.fb.control<string[]>([]),
    },
    { validators: datesInOrder('inServiceFrom', 'inServiceTo', 'Must not be before the in-service date') },
  );

  protected readonly site = signal<SiteDetail | null>(null);
  protected readonly unit = signal<EmissionUnit | null>(null);

  protected readonly readOnlyFields = computed<ReadOnlyField[]>(() => {
    const unit = this.unit();
    if (!unit) return [];
    return [
      { label: 'Type', value: unitTypeLabels[unit.unitType] },
      { label: 'Rated thermal input', value: `${unit.ratedThermalInputMWth} MWth` },
      { label: 'In service from', value: unit.inServiceFrom },
      { label: 'In service to', value: unit.inServiceTo ?? 'In service' },
      { label: 'Fuels burned', value: namesOf(unit.fuelIds, this.site()?.fuels ?? []) },
    ];
  });

  constructor() {
    effect(() => void this.load(this.siteId(), this.unitId()));
  }

  hasUnsavedChanges(): boolean {
    return this.editor.hasUnsavedChanges(this.form);
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected reload(): Promise<void> {
    return this.load(this.siteId(), this.unitId());
  }

  private load(siteId: string, unitId: string | undefined): Promise<void> {
    return this.editor.load(async () => {
      const [site, unit] = await Promise.all([
        firstValueFrom(this.api.getSite(siteId)),
        unitId ? firstValueFrom(this.api.getUnit(unitId)) : Promise.resolve(null),
      ]);
      this.site.set(site);
      this.unit.set(unit);
      if (unit) {
        this.form.reset({
          name: unit.name,
          unitType: unit.unitType,
          ratedThermalInputMWth: unit.ratedThermalInputMWth,
          inServiceFrom: unit.inServiceFrom,
          inServiceTo: unit.inServiceTo ?? '',
          fuelIds: unit.fuelIds,
        });
      }
    });
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body: UnitInput = {
        name: value.name.trim(),
        unitType: value.unitType,
        ratedThermalInputMWth: value.ratedThermalInputMWth as number,
        inServiceFrom: value.inServiceFrom,
        inServiceTo: value.inServiceTo || null,
        fuelIds: value.fuelIds,
      };
      const current = this.unit();
      if (current) await firstValueFrom(this.api.updateUnit(current.id, { ...body, version: current.version }));
      else await firstValueFrom(this.api.createUnit(this.siteId(), body));
      this.form.markAsPristine();
      this.editor.notify(current ? 'Emission unit saved.' : `Emission unit “${body.name}” added.`);
      await this.router.navigate(['/sites', this.siteId()]);
    });
  }

  protected async archive(): Promise<void> {
    const unit = this.unit();
    if (!unit) return;
    const message = `Emission unit “${unit.name}” archived. Its history is kept.`;
    await this.editor.archive(this.api.archiveUnit(unit.id, unit.version), this.form, message, this.siteId());
  }
}
