import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { EmissionUnit, SiteDetail, SitesApi, UnitInput, UnitType } from '../../../core/api/sites-api';
import { Auth } from '../../../core/auth/auth';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { datesInOrder } from '../../../shared/date-range';
import { classifySaveError, fieldError } from '../../../shared/form-errors';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import { unitTypeLabels } from '../../../shared/setup-labels';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';

/** Adds or changes an emission unit; people without `site:write` see it read-only. */
@Component({
  selector: 'fl-unit-form',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    ConflictNotice,
    ReadOnlyFields,
  ],
  templateUrl: './unit-form.html',
  styleUrl: './unit-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class UnitForm implements HasUnsavedChanges {
  private readonly api = inject(SitesApi);
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly siteId = input.required<string>();
  /** Absent on …/units/new. */
  readonly unitId = input<string>();

  protected readonly canEdit = computed(() => this.auth.me()?.permissions.includes('site:write') ?? false);
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
  protected readonly status = signal<'loading' | 'ready' | 'failed'>('loading');
  protected readonly saving = signal(false);
  protected readonly conflict = signal(false);

  protected readonly readOnlyFields = computed<ReadOnlyField[]>(() => {
    const unit = this.unit();
    if (!unit) return [];
    const fuelNames = new Map((this.site()?.fuels ?? []).map((fuel) => [fuel.id, fuel.name]));
    return [
      { label: 'Type', value: unitTypeLabels[unit.unitType] },
      { label: 'Rated thermal input', value: `${unit.ratedThermalInputMWth} MWth` },
      { label: 'In service from', value: unit.inServiceFrom },
      { label: 'In service to', value: unit.inServiceTo ?? 'In service' },
      { label: 'Fuels burned', value: unit.fuelIds.map((id) => fuelNames.get(id) ?? '').filter(Boolean).join(', ') },
    ];
  });

  constructor() {
    effect(() => void this.load(this.siteId(), this.unitId()));
  }

  hasUnsavedChanges(): boolean {
    return this.canEdit() && this.form.dirty && !this.saving();
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected reload(): Promise<void> {
    return this.load(this.siteId(), this.unitId());
  }

  private async load(siteId: string, unitId: string | undefined): Promise<void> {
    this.status.set('loading');
    try {
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
      this.conflict.set(false);
      this.status.set('ready');
    } catch {
      this.status.set('failed');
    }
  }

  protected async save(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const value = this.form.getRawValue();
    const body: UnitInput = {
      name: value.name.trim(),
      unitType: value.unitType,
      ratedThermalInputMWth: value.ratedThermalInputMWth as number,
      inServiceFrom: value.inServiceFrom,
      inServiceTo: value.inServiceTo || null,
      fuelIds: value.fuelIds,
    };
    this.saving.set(true);
    try {
      const current = this.unit();
      if (current) await firstValueFrom(this.api.updateUnit(current.id, { ...body, version: current.version }));
      else await firstValueFrom(this.api.createUnit(this.siteId(), body));
      this.form.markAsPristine();
      this.snackBar.open(current ? 'Emission unit saved.' : `Emission unit “${body.name}” added.`, 'Close', { duration: 5000 });
      await this.router.navigate(['/sites', this.siteId()]);
    } catch (error) {
      if (classifySaveError(error, this.form) === 'stale') this.conflict.set(true);
    } finally {
      this.saving.set(false);
    }
  }

  protected async archive(): Promise<void> {
    const unit = this.unit();
    if (!unit) return;
    try {
      await firstValueFrom(this.api.archiveUnit(unit.id, unit.version));
      this.form.markAsPristine();
      this.snackBar.open(`Emission unit “${unit.name}” archived. Its history is kept.`, 'Close', { duration: 5000 });
      await this.router.navigate(['/sites', this.siteId()]);
    } catch (error) {
      if (classifySaveError(error) === 'stale') this.conflict.set(true);
    }
  }
}
