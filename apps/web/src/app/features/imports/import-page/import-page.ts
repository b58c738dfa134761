import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import { catchError, forkJoin, of, switchMap } from 'rxjs';

import { CommitResult, ImportDraft, ImportSummary, ImportsApi } from '../../../core/api/imports-api';
import { Site, SitesApi, StackWithChannels } from '../../../core/api/sites-api';
import { Auth } from '../../../core/auth/auth';
import { CalcCaution } from '../../../shared/calc-caution';
import { formatNumber } from '../../../shared/format-number';
import { StackPicker } from '../../../shared/stack-picker/stack-picker';
import { ImportHistory } from '../import-history/import-history';
import { MappingStep } from '../mapping-step/mapping-step';
import { PreviewStep } from '../preview-step/preview-step';
import { UploadStep } from '../upload-step/upload-step';

type Step = 'upload' | 'mapping' | 'preview' | 'done';

/**
 * The monthly import of a stack's data logger export: upload, confirm the column mapping,
 * preview every problem, commit. The stack's import history with rollback sits below.
 */
@Component({
  selector: 'fl-import-page',
  imports: [MatButtonModule, MatIconModule, RouterLink, CalcCaution, StackPicker, UploadStep, MappingStep, PreviewStep, ImportHistory],
  templateUrl: './import-page.html',
  styleUrl: './import-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportPage {
  private readonly sitesApi = inject(SitesApi);
  private readonly importsApi = inject(ImportsApi);
  private readonly router = inject(Router);
  private readonly auth = inject(Auth);

  /** From the route `imports/stacks/:stackId`. */
  readonly stackId = input<string | undefined>(undefined);

  protected readonly stack = signal<StackWithChannels | null>(null);
  protected readonly site = signal<Site | null>(null);
  protected readonly stackStatus = signal<'none' | 'loading' | 'loaded' | 'failed'>('none');
  protected readonly channels = computed(() => (this.stack()?.channels ?? []).filter((channel) => !channel.archivedAt));
  protected readonly timeZone = computed(() => this.site()?.timeZone ?? null);
  protected readonly canImport = computed(() => this.auth.can('data:import'));

  protected readonly step = signal<Step>('upload');
  protected readonly draft = signal<ImportDraft | null>(null);
  protected readonly result = signal<CommitResult | null>(null);
  protected readonly historyKey = signal(0);
  protected readonly formatNumber = formatNumber;

  protected readonly steps: { key: Step; label: string }[] = [
    { key: 'upload', label: 'Upload' },
    { key: 'mapping', label: 'Map columns' },
    { key: 'preview', label: 'Preview and commit' },
    { key: 'done', label: 'Done' },
  ];
  protected readonly stepIndex = computed(() => this.steps.findIndex((s) => s.key === this.step()));

  constructor() {
    effect((onCleanup) => {
      const stackId = this.stackId();
      this.reset();
      this.stack.set(null);
      this.site.set(null);
      if (!stackId) {
        this.stackStatus.set('none');
        return;
      }
      this.stackStatus.set('loading');
      const subscription = this.sitesApi
        .getStack(stackId)
        .pipe(
          switchMap((stack) => forkJoin({ stack: of(stack), site: this.sitesApi.getSite(stack.siteId).pipe(catchError(() => of(null))) })),
        )
        .subscribe({
          next: ({ stack, site }) => {
            this.stack.set(stack);
            this.site.set(site);
            this.stackStatus.set('loaded');
          },
          error: () => this.stackStatus.set('failed'),
        });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  protected chooseStack(stackId: string): void {
    void this.router.navigate(['/imports/stacks', stackId]);
  }

  protected templateUrl(stackId: string): string {
    return this.importsApi.templateUrl(stackId);
  }

  protected onUploaded(draft: ImportDraft): void {
    this.draft.set(draft);
    this.step.set('mapping');
  }

  protected onMapped(draft: ImportDraft): void {
    this.draft.set(draft);
    this.step.set('preview');
  }

  protected onCommitted(result: CommitResult): void {
    this.result.set(result);
    this.step.set('done');
    this.historyKey.update((n) => n + 1);
  }

  protected resume(entry: ImportSummary): void {
    this.importsApi.get(entry.id).subscribe((draft) => {
      this.draft.set(draft);
      this.result.set(null);
      this.step.set('mapping');
    });
  }

  protected reset(): void {
    this.draft.set(null);
    this.result.set(null);
    this.step.set('upload');
  }
}
