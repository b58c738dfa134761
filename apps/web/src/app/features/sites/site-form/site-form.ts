import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { Regime, Site, SiteInput, SitesApi } from '../../../core/api/sites-api';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { FormActions } from '../../../shared/form-actions';
import { fieldError } from '../../../shared/form-errors';
import { LoadState } from '../../../shared/load-state';
import { PageHeader } from '../../../shared/page-header';
import { RecordEditor } from '../../../shared/record-editor';
import { regimeLabels } from '../../../shared/setup-labels';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';

/** Every IANA zone this browser knows, for the time-zone suggestions. */
const timeZones: readonly string[] = (() => {
  const intl = Intl as unknown as { supportedValuesOf?: (key: string) => string[] };
  return intl.supportedValuesOf?.('timeZone') ?? ['UTC'];
})();

function timeZoneValidator(control: AbstractControl<string>): ValidationErrors | null {
  if (!control.value) return null;
  try {
    new Intl.DateTimeFormat('en', { timeZone: control.value });
    return null;
  } catch {
    return { timeZone: 'Not a known time zone: use an IANA name such as Europe/Berlin' };
  }
}

const regionNames = new Intl.DisplayNames(['en'], { type: 'region' });

/** The country's name for a two-letter code, or null when the code is not a country. */
export function countryName(code: string): string | null {
  const upper = code.trim().toUpperCase();
  if (!/^[A-Z]{2}$/.test(upper)) return null;
  try {
    const name = regionNames.of(upper);
    return name && name !== upper && name !== 'Unknown Region' ? name : null;
  } catch {
    return null;
  }
}

function countryValidator(control: AbstractControl<string>): ValidationErrors | null {
  if (!control.value) return null;
  return countryName(control.value) ? null : { country: 'Use a two-letter ISO 3166-1 country code, e.g. DE or US' };
}

/** Adds a site (`/sites/new`) or changes one (`/sites/:siteId/edit`). */
@Component({
  selector: 'fl-site-form',
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatAutocompleteModule,
    ConflictNotice,
    FormActions,
    LoadState,
    PageHeader,
  ],
  providers: [RecordEditor],
  templateUrl: './site-form.html',
  styleUrl: './site-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class SiteForm implements HasUnsavedChanges {
  private readonly api = inject(SitesApi);
  private readonly router = inject(Router);
  protected readonly editor = inject(RecordEditor);
  private readonly fb = inject(NonNullableFormBuilder);

  /** Route parameter; absent on /sites/new. */
  readonly siteId = input<string>();

  protected readonly regimes = Object.keys(regimeLabels) as Regime[];
  protected readonly regimeLabels = regimeLabels;
  protected readonly fieldError = fieldError;

  protected readonly form = this.fb.group({
    name: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
    timeZone: this.fb.control(Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC', [Validators.required, timeZoneValidator]),
    country: this.fb.control('', [Validators.required, countryValidator]),
    regime: this.fb.control<Regime>('eu_ied', Validators.required),
    address: this.fb.control('', Validators.maxLength(1000)),
  });

  protected readonly site = signal<Site | null>(null);

  private readonly timeZoneText = toSignal(this.form.controls.timeZone.valueChanges, { initialValue: this.form.controls.timeZone.value });
  private readonly countryText = toSignal(this.form.controls.country.valueChanges, { initialValue: '' });
  protected readonly timeZoneOptions = computed(() => {
    const text = this.timeZoneText().toLowerCase();
    return timeZones.filter((zone) => zone.toLowerCase().includes(text)).slice(0, 30);
  });
  protected readonly countryHint = computed(() => countryName(this.countryText()) ?? 'Two letters, ISO 3166-1 (e.g. DE, US)');

  constructor() {
    // A new site has nothing to load.
    this.editor.status.set('ready');
    effect(() => {
      const siteId = this.siteId();
      if (siteId) void this.load(siteId);
    });
  }

  hasUnsavedChanges(): boolean {
    // The route lets only people who may edit reach this form.
    return this.form.dirty && !this.editor.saving();
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected async reload(): Promise<void> {
    const siteId = this.siteId();
    if (siteId) await this.load(siteId);
  }

  private load(siteId: string): Promise<void> {
    return this.editor.load(async () => {
      const site = await firstValueFrom(this.api.getSite(siteId));
      this.site.set(site);
      this.form.reset({
        name: site.name,
        timeZone: site.timeZone,
        country: site.country,
        regime: site.regime,
        address: site.address ?? '',
      });
    });
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body: SiteInput = {
        name: value.name.trim(),
        timeZone: value.timeZone.trim(),
        country: value.country.trim().toUpperCase(),
        regime: value.regime,
        address: value.address.trim() || null,
      };
      const current = this.site();
      const saved = current
        ? await firstValueFrom(this.api.updateSite(current.id, { ...body, version: current.version }))
        : await firstValueFrom(this.api.createSite(body));
      this.form.markAsPristine();
      this.editor.notify(current ? 'Site saved.' : `Site “${saved.name}” added. Next, add its emission units.`);
      await this.router.navigate(['/sites', saved.id]);
    });
  }
}
