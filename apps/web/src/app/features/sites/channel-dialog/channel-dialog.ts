import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';

import { Basis, Channel, ChannelInput, ChannelParameter, ChannelUnit, Conditions, SitesApi } from '../../../core/api/sites-api';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { fieldError } from '../../../shared/form-errors';
import { RecordEditor } from '../../../shared/record-editor';
import {
  basisLabels,
  channelParameters,
  conditionsLabels,
  intervalMinutesOptions,
  parameterLabels,
  unitLabel,
  unitsByParameter,
} from '../../../shared/setup-labels';

export interface ChannelDialogData {
  stackId: string;
  /** The channel to change; absent to add one. */
  channel?: Channel;
}

/** Wet-basis, actual-conditions readings are rare for gas analysers: most extractive CEMS report dry. */
function defaultBasis(parameter: ChannelParameter): Basis {
  return parameter === 'H2O' ? 'wet' : 'dry';
}

function rangeInOrder(group: AbstractControl): ValidationErrors | null {
  const min = group.get('rangeMin')?.value as number | null;
  const maxControl = group.get('rangeMax');
  const max = maxControl?.value as number | null;
  if (min !== null && max !== null && !(min < max)) {
    maxControl?.setErrors({ ...(maxControl.errors ?? {}), order: 'Must be greater than the range minimum' });
    return { order: true };
  }
  return null;
}

/** Adds or changes one monitored channel of a stack; closes with the saved channel. */
@Component({
  selector: 'fl-channel-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    ConflictNotice,
  ],
  providers: [RecordEditor],
  templateUrl: './channel-dialog.html',
  styleUrl: './channel-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChannelDialog {
  private readonly api = inject(SitesApi);
  private readonly dialogRef = inject<MatDialogRef<ChannelDialog, Channel>>(MatDialogRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly editor = inject(RecordEditor);
  protected readonly data = inject<ChannelDialogData>(MAT_DIALOG_DATA);

  protected readonly parameters = channelParameters;
  protected readonly parameterLabels = parameterLabels;
  protected readonly basisOptions = Object.keys(basisLabels) as Basis[];
  protected readonly basisLabels = basisLabels;
  protected readonly conditionsOptions = Object.keys(conditionsLabels) as Conditions[];
  protected readonly conditionsLabels = conditionsLabels;
  protected readonly intervals = intervalMinutesOptions;
  protected readonly unitLabel = unitLabel;
  protected readonly fieldError = fieldError;

  private readonly channel = this.data.channel;
  protected readonly form = this.fb.group(
    {
      parameter: this.fb.control<ChannelParameter>(this.channel?.parameter ?? 'NOx', Validators.required),
      unit: this.fb.control<ChannelUnit>(this.channel?.unit ?? 'mg/Nm3', Validators.required),
      basis: this.fb.control<Basis>(this.channel?.basis ?? 'dry', Validators.required),
      conditions: this.fb.control<Conditions>(this.channel?.conditions ?? 'standard', Validators.required),
      rangeMin: this.fb.control<number | null>(this.channel?.rangeMin ?? null),
      rangeMax: this.fb.control<number | null>(this.channel?.rangeMax ?? null),
      intervalMinutes: this.fb.control<number>(this.channel?.intervalMinutes ?? 1, Validators.required),
      sourceLabel: this.fb.control(this.channel?.sourceLabel ?? '', Validators.maxLength(200)),
    },
    { validators: rangeInOrder },
  );

  private readonly parameter = toSignal(this.form.controls.parameter.valueChanges, {
    initialValue: this.form.controls.parameter.value,
  });
  private readonly unit = toSignal(this.form.controls.unit.valueChanges, { initialValue: this.form.controls.unit.value });
  protected readonly units = computed(() => unitsByParameter[this.parameter()]);
  protected readonly unitText = computed(() => unitLabel(this.unit()));

  constructor() {
    // A parameter's units differ (O2 in %, NOx in mg/Nm3 or ppm): keep the unit one that fits.
    this.form.controls.parameter.valueChanges.pipe(takeUntilDestroyed()).subscribe((parameter) => {
      const allowed = unitsByParameter[parameter];
      if (!allowed.includes(this.form.controls.unit.value)) this.form.controls.unit.setValue(allowed[0]);
      if (!this.channel) this.form.controls.basis.setValue(defaultBasis(parameter));
    });
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body: ChannelInput = { ...value, sourceLabel: value.sourceLabel.trim() || null };
      const saved = this.channel
        ? await firstValueFrom(this.api.updateChannel(this.channel.id, { ...body, version: this.channel.version }))
        : await firstValueFrom(this.api.createChannel(this.data.stackId, body));
      this.dialogRef.close(saved);
    });
  }

  /** The stored channel moved on: close, and let the stack page load the current one. */
  protected reload(): void {
    this.dialogRef.close(undefined);
  }
}
