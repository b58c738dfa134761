import { DecimalPipe } from '@angular/common';
import { HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { Limit, MAX_PERMIT_DOCUMENT_BYTES, PermitDetail, PermitInput, PermitsApi } from '../../../core/api/permits-api';
import { SiteDetail, SitesApi } from '../../../core/api/sites-api';
import { ClientTable } from '../../../shared/client-table';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { datesInOrder } from '../../../shared/date-range';
import { FilterField } from '../../../shared/filter-field';
import { FormActions } from '../../../shared/form-actions';
import { classifySaveError, fieldError } from '../../../shared/form-errors';
import { LoadState } from '../../../shared/load-state';
import { PageHeader } from '../../../shared/page-header';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import { RecordEditor } from '../../../shared/record-editor';
import { RowActions } from '../../../shared/row-actions';
import { parameterLabels, periodLabels, unitLabel } from '../../../shared/setup-labels';
import { TablePager } from '../../../shared/table-pager';
import { upsertById } from '../../../shared/upsert-by-id';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';
import { LimitDialog, LimitDialogData } from '../limit-dialog/limit-dialog';

export interface LimitRow {
  limit: Limit;
  target: string;
  pollutant: string;
  elv: number;
  elvText: string;
  referenceO2: string;
  period: string;
  summary: string;
}

/** Why a chosen file cannot be the permit document, or null when it can. */
export function permitFileProblem(file: File): string | null {
  const looksPdf = file.type === 'application/pdf' || file.name.toLowerCase().endsWith('.pdf');
  if (!looksPdf) return `“${file.name}” is not a PDF. Choose the permit as a PDF file.`;
  if (file.size > MAX_PERMIT_DOCUMENT_BYTES) {
    return `“${file.name}” is ${(file.size / 1024 / 1024).toFixed(1)} MB; the permit PDF may be at most ${MAX_PERMIT_DOCUMENT_BYTES / 1024 / 1024} MB.`;
  }
  return null;
}

/**
 * A permit: its reference, authority and dates, its PDF, and the table of its emission limits,
 * each with its plain-language summary. Limits and the PDF are added once the permit is saved.
 */
@Component({
  selector: 'fl-permit-editor',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatTableModule,
    MatSortModule,
    MatProgressBarModule,
    ConflictNotice,
    FilterField,
    FormActions,
    LoadState,
    PageHeader,
    ReadOnlyFields,
    RowActions,
    TablePager,
  ],
  providers: [RecordEditor],
  templateUrl: './permit-editor.html',
  styleUrl: './permit-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class PermitEditor implements HasUnsavedChanges {
  private readonly permitsApi = inject(PermitsApi);
  private readonly sitesApi = inject(SitesApi);
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  protected readonly editor = inject(RecordEditor);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly siteId = input.required<string>();
  /** Absent on …/permits/new. */
  readonly permitId = input<string>();

  protected readonly fieldError = fieldError;

  protected readonly form = this.fb.group(
    {
      reference: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
      authority: this.fb.control('', [Validators.required, Validators.maxLength(500)]),
      effectiveFrom: this.fb.control('', Validators.required),
      effectiveTo: this.fb.control(''),
    },
    { validators: datesInOrder('effectiveFrom', 'effectiveTo', 'Must not be before the effective-from date') },
  );

  protected readonly site = signal<SiteDetail | null>(null);
  protected readonly permit = signal<PermitDetail | null>(null);
  protected readonly filter = signal('');
  protected readonly upload = signal<{ fileName: string; percent: number } | null>(null);
  protected readonly uploadProblem = signal<string | null>(null);

  protected readonly hasTargets = computed(() => {
    const site = this.site();
    return Boolean(site && (site.stacks.length || site.units.length));
  });

  protected readonly readOnlyFields = computed<ReadOnlyField[]>(() => {
    const permit = this.permit();
    if (!permit) return [];
    return [
      { label: 'Reference', value: permit.reference },
      { label: 'Authority', value: permit.authority },
      { label: 'Effective from', value: permit.effectiveFrom },
      { label: 'Effective to', value: permit.effectiveTo ?? 'Open-ended' },
    ];
  });

  private readonly limitRows = computed<LimitRow[]>(() => {
    const site = this.site();
    const stacks = new Map((site?.stacks ?? []).map((stack) => [stack.id, stack.name]));
    const units = new Map((site?.units ?? []).map((unit) => [unit.id, unit.name]));
    return (this.permit()?.limits ?? [])
      .filter((limit) => !limit.archivedAt)
      .map((limit) => ({
        limit,
        target: limit.stackId ? `Stack: ${stacks.get(limit.stackId) ?? ''}` : `Unit: ${units.get(limit.unitId ?? '') ?? ''}`,
        pollutant: parameterLabels[limit.pollutant],
        elv: limit.elv,
        elvText: `${limit.elv} ${unitLabel(limit.unit)}`,
        referenceO2: limit.referenceO2Percent === null ? '' : `${limit.referenceO2Percent} % O2`,
        period: periodLabels[limit.period],
        summary: limit.summary,
      }));
  });

  protected readonly limits = new ClientTable<LimitRow>({
    rows: this.limitRows,
    filter: this.filter,
    text: (row) => [row.target, row.pollutant, row.elvText, row.period, row.summary].join(' '),
    sortValue: (row, column) => (column === 'elv' ? row.elv : ((row as unknown as Record<string, string>)[column] ?? null)),
    initialSort: { active: 'pollutant', direction: 'asc' },
  });

  protected readonly limitColumns = computed(() => {
    const columns = ['target', 'pollutant', 'elv', 'period', 'summary'];
    return this.editor.canEdit() ? [...columns, 'actions'] : columns;
  });

  /** Dialogs still open when the page goes away close without a result; nothing to refresh then. */
  private destroyed = false;

  constructor() {
    inject(DestroyRef).onDestroy(() => (this.destroyed = true));
    effect(() => void this.load(this.siteId(), this.permitId()));
  }

  hasUnsavedChanges(): boolean {
    return this.editor.hasUnsavedChanges(this.form);
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected reload(): Promise<void> {
    return this.load(this.siteId(), this.permitId());
  }

  private load(siteId: string, permitId: string | undefined): Promise<void> {
    return this.editor.load(async () => {
      const [site, permit] = await Promise.all([
        firstValueFrom(this.sitesApi.getSite(siteId)),
        permitId ? firstValueFrom(this.permitsApi.getPermit(permitId)) : Promise.resolve(null),
      ]);
      this.site.set(site);
      this.permit.set(permit);
      if (permit) {
        this.form.reset({
          reference: permit.reference,
          authority: permit.authority,
          effectiveFrom: permit.effectiveFrom,
          effectiveTo: permit.effectiveTo ?? '',
        });
      }
    });
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body: PermitInput = {
        reference: value.reference.trim(),
        authority: value.authority.trim(),
        effectiveFrom: value.effectiveFrom,
        effectiveTo: value.effectiveTo || null,
      };
      const current = this.permit();
      if (current) {
        const saved = await firstValueFrom(this.permitsApi.updatePermit(current.id, { ...body, version: current.version }));
        this.permit.set({ ...current, ...saved });
        this.form.markAsPristine();
        this.editor.notify('Permit saved.');
      } else {
        const created = await firstValueFrom(this.permitsApi.createPermit(this.siteId(), body));
        this.form.markAsPristine();
        this.editor.notify(`Permit “${created.reference}” added. Now upload its PDF and enter its limits.`, 6000);
        await this.router.navigate(['/sites', this.siteId(), 'permits', created.id], { replaceUrl: true });
      }
    });
  }

  protected async archive(): Promise<void> {
    const permit = this.permit();
    if (!permit) return;
    const message = `Permit “${permit.reference}” archived. Its history is kept.`;
    await this.editor.archive(this.permitsApi.archivePermit(permit.id, permit.version), this.form, message, this.siteId());
  }

  protected documentUrl(): string {
    const permit = this.permit();
    return permit ? this.permitsApi.documentUrl(permit.id) : '';
  }

  protected onFileChosen(event: Event): void {
    const inputElement = event.target as HTMLInputElement;
    const file = inputElement.files?.[0];
    inputElement.value = '';
    if (file) this.uploadFile(file);
  }

  protected uploadFile(file: File): void {
    const permit = this.permit();
    if (!permit) return;
    const problem = permitFileProblem(file);
    this.uploadProblem.set(problem);
    if (problem) return;
    this.upload.set({ fileName: file.name, percent: 0 });
    this.permitsApi.uploadDocument(permit.id, file).subscribe({
      next: (event) => {
        if (event.type === HttpEventType.UploadProgress) {
          const percent = event.total ? Math.round((100 * event.loaded) / event.total) : 0;
          this.upload.set({ fileName: file.name, percent });
        } else if (event.type === HttpEventType.Response && event.body) {
          const saved = event.body;
          this.permit.update((current) => (current ? { ...current, ...saved, limits: current.limits } : current));
          this.upload.set(null);
          this.editor.notify(`Permit PDF “${file.name}” uploaded.`);
        }
      },
      // The error interceptor has shown why (not a PDF, too large …).
      error: () => this.upload.set(null),
    });
  }

  protected async openLimit(limit?: Limit): Promise<void> {
    const permit = this.permit();
    const site = this.site();
    if (!permit || !site) return;
    const ref = this.dialog.open<LimitDialog, LimitDialogData, Limit>(LimitDialog, {
      data: { permitId: permit.id, site, permitEffectiveFrom: permit.effectiveFrom, limit },
      width: '860px',
      maxWidth: '95vw',
    });
    const saved = await firstValueFrom(ref.afterClosed());
    if (!saved) {
      // Closed without a limit: cancelled, or the dialog found the limit changed meanwhile.
      if (limit && !this.destroyed) await this.refreshLimits();
      return;
    }
    this.permit.update((current) => (current ? { ...current, limits: upsertById(current.limits, saved) } : current));
    this.editor.notify(`Limit saved: ${saved.summary}`, 6000);
  }

  protected async archiveLimit(limit: Limit): Promise<void> {
    try {
      const archived = await firstValueFrom(this.permitsApi.archiveLimit(limit.id, limit.version));
      this.permit.update((current) => (current ? { ...current, limits: upsertById(current.limits, archived) } : current));
      this.editor.notify('Limit archived. It stays in the permit history.');
    } catch (error) {
      if (classifySaveError(error) === 'stale') await this.refreshLimits();
    }
  }

  private async refreshLimits(): Promise<void> {
    const permit = this.permit();
    if (!permit) return;
    const fresh = await firstValueFrom(this.permitsApi.getPermit(permit.id));
    this.permit.update((current) => (current ? { ...current, limits: fresh.limits } : current));
  }

  protected onFilter(text: string): void {
    this.limits.pageIndex.set(0);
    this.filter.set(text);
  }

  protected limitName(row: LimitRow): string {
    return `${row.pollutant} ${row.elvText}, ${row.period.toLowerCase()}`;
  }
}
