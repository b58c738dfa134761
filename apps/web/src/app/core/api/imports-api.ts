import { HttpClient, HttpContext, HttpEvent, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import { messageShownByCaller } from './api-error';
import { ListPage } from './list-page';

// Shapes of apps/api/src/modules/imports/imports.schemas.ts (the source of truth).

export type IntervalConvention = 'interval_end' | 'interval_start';
export type ImportState = 'parsed' | 'mapped' | 'committing' | 'committed' | 'rolled_back' | 'failed';

/** Server-side work on an import: what it is doing and how far it got. */
export interface ImportProgress {
  phase: string | null;
  done: number | null;
  total: number | null;
  updatedAt: string | null;
}

export interface ImportCounts {
  rows: number;
  cells: number;
  problems: number;
  inserted: number | null;
  unchanged: number | null;
  superseded: number | null;
  conflicts: number | null;
}

/** A span of time, ISO 8601 UTC instants. */
export interface TimeSpan {
  from: string;
  to: string;
}

/** One column of the uploaded sheet and what it should become. */
export interface ImportColumn {
  index: number;
  /** Spreadsheet column letter, e.g. "C". */
  letter: string;
  header: string;
  unitHint: string | null;
  parameterHint: string | null;
  basisHint: string | null;
  suggestedChannelId: string | null;
  /** Why the suggestion was made, e.g. the stack's saved map or a header match. */
  suggestionSource: string | null;
  mappedChannelId: string | null;
  sample: (number | null)[];
  numbers: number;
  problems: number;
}

export interface ImportSummary {
  id: string;
  stackId: string;
  fileName: string;
  sha256: string;
  sizeBytes: number;
  format: string;
  state: ImportState;
  uploadedAt: string;
  uploadedBy: string;
  uploadedByName: string | null;
  rowCount: number;
  span: TimeSpan | null;
  problemCount: number;
  counts: ImportCounts;
  committedAt: string | null;
  rolledBackAt: string | null;
  rollbackReason: string | null;
}

export interface ImportDraft extends ImportSummary {
  sheetName: string | null;
  headerRow: number | null;
  timestampColumn: number;
  timestampHeader: string;
  statusColumn: number | null;
  intervalConvention: IntervalConvention;
  intervalSeconds: number | null;
  period: { from: string | null; to: string | null };
  columns: ImportColumn[];
  notes: string[];
  problemCountsByCode: Record<string, number>;
  duplicates: number;
  /** The same file (same SHA-256) was already committed for this stack. */
  alreadyImported: { importId: string; committedAt: string } | null;
  failureMessage: string | null;
  progress: ImportProgress;
}

export interface UploadOptions {
  intervalConvention?: IntervalConvention;
  /** YYYY-MM-DD; readings outside the declared period are reported as problems. */
  periodFrom?: string;
  periodTo?: string;
}

export interface MappingBody {
  columns: { index: number; channelId: string | null }[];
  timestampColumn: number;
  statusColumn?: number | null;
  intervalConvention: IntervalConvention;
  saveAsStackMap: boolean;
}

export interface ImportProblem {
  /** Row number in the sheet, as a spreadsheet shows it. */
  row: number;
  /** Column letter and header, e.g. "C (NOx mg/Nm3)". */
  column: string;
  columnIndex: number;
  value: string;
  code: string;
  reason: string;
}

export interface ChannelTotals {
  channelId: string;
  columnIndex: number;
  count: number;
  valid: number;
  invalid: number;
  min: number | null;
  max: number | null;
  mean: number | null;
}

export interface ImportPreview {
  sampleRows: { row: number; t: string; status: string; values: Record<string, number | null> }[];
  /** The first problems (the API caps the list); the workbook holds all of them. */
  problems: ImportProblem[];
  problemCount: number;
  perChannel: ChannelTotals[];
  span: TimeSpan | null;
  intervalSeconds: number | null;
  gaps: TimeSpan[];
  duplicates: number;
  overlap: { new: number; unchanged: number; conflicting: number };
  notes: string[];
}

export interface CommitBody {
  replaceConflicts?: boolean;
  reason?: string;
}

export interface CommitResult {
  inserted: number;
  unchanged: number;
  superseded: number;
  conflicts: number;
  nothingNew: boolean;
}

export interface RollbackResult {
  withdrawn: number;
  restored: number;
  state: ImportState;
}

/** The import of data logger workbooks into a stack's readings (`data:import`; reading needs `data:read`). */
@Injectable({ providedIn: 'root' })
export class ImportsApi {
  private readonly http = inject(HttpClient);

  /** Uploads the file (multipart field "file") and reports upload progress as HTTP events. */
  upload(stackId: string, file: File, options: UploadOptions = {}): Observable<HttpEvent<ImportDraft>> {
    const body = new FormData();
    if (options.intervalConvention) body.append('intervalConvention', options.intervalConvention);
    if (options.periodFrom) body.append('periodFrom', options.periodFrom);
    if (options.periodTo) body.append('periodTo', options.periodTo);
    // Fields before the file, so the server knows them when the file stream arrives.
    body.append('file', file, file.name);
    // The upload step shows a refusal next to the file field: no second copy in a snackbar.
    return this.http.post<ImportDraft>(`/api/stacks/${stackId}/imports`, body, { reportProgress: true, observe: 'events', context: messageShownByCaller() });
  }

  list(stackId: string, limit: number, offset: number): Observable<ListPage<ImportSummary>> {
    const params = new HttpParams().set('limit', limit).set('offset', offset);
    return this.http.get<ListPage<ImportSummary>>(`/api/stacks/${stackId}/imports`, { params });
  }

  get(importId: string): Observable<ImportDraft> {
    return this.http.get<ImportDraft>(`/api/imports/${importId}`);
  }

  /** Polled while a long request runs; errors stay quiet (the long request reports its own). */
  progress(importId: string, context?: HttpContext): Observable<ImportProgress> {
    return this.http.get<ImportProgress>(`/api/imports/${importId}/progress`, { context });
  }

  saveMapping(importId: string, body: MappingBody): Observable<ImportDraft> {
    return this.http.put<ImportDraft>(`/api/imports/${importId}/mapping`, body);
  }

  preview(importId: string): Observable<ImportPreview> {
    return this.http.get<ImportPreview>(`/api/imports/${importId}/preview`);
  }

  /** A 409 `conflicts` answer is the caller's to explain, so `context` usually marks it handled. */
  commit(importId: string, body: CommitBody, context?: HttpContext): Observable<CommitResult> {
    return this.http.post<CommitResult>(`/api/imports/${importId}/commit`, body, { context });
  }

  rollback(importId: string, reason: string): Observable<RollbackResult> {
    return this.http.post<RollbackResult>(`/api/imports/${importId}/rollback`, { reason });
  }

  /** Where the browser downloads the workbook of every problem of an import. */
  problemsWorkbookUrl(importId: string): string {
    return `/api/imports/${importId}/problems.xlsx`;
  }

  /** Where the browser downloads the stack's example workbook (timestamp + one column per channel). */
  templateUrl(stackId: string): string {
    return `/api/stacks/${stackId}/template.xlsx`;
  }
}
