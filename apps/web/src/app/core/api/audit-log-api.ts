import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

export interface AuditEntry {
  id: number;
  /** ISO 8601 timestamp. */
  at: string;
  /** Null when the system acted (a scheduled job, a migration). */
  actor: { id: string; name: string; email: string } | null;
  action: string;
  entity: string;
  entityId: string | null;
  /** Snapshot of the record before the action (usually an object; null when it was created). */
  before: unknown;
  /** Snapshot after the action (null when the record was removed). */
  after: unknown;
}

export interface AuditLogPage {
  items: AuditEntry[];
  total: number;
}

export interface AuditLogQuery {
  limit: number;
  offset: number;
  /** Only entries about this kind of record, e.g. `membership`. */
  entity?: string;
}

/** The active organisation's append-only audit trail (needs `audit:read`). */
@Injectable({ providedIn: 'root' })
export class AuditLogApi {
  private readonly http = inject(HttpClient);

  list(query: AuditLogQuery): Observable<AuditLogPage> {
    let params = new HttpParams().set('limit', query.limit).set('offset', query.offset);
    if (query.entity) params = params.set('entity', query.entity);
    return this.http.get<AuditLogPage>('/api/audit-log', { params });
  }
}
