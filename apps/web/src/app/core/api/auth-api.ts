import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import { handledByCaller } from './api-error';

export type Role = 'admin' | 'officer' | 'manager' | 'auditor';

/** An action key from the API's permission map, e.g. `members:read` or `data:import`. */
export type Permission = string;

export interface OrganisationMembership {
  id: string;
  name: string;
  slug: string;
  role: Role;
}

/** Who is signed in, in which organisation, and what they may do there (`GET /api/me`). */
export interface Me {
  user: { id: string; email: string; name: string };
  organisation: { id: string; name: string; slug: string };
  role: Role;
  permissions: Permission[];
  organisations: OrganisationMembership[];
}

export interface Credentials {
  email: string;
  password: string;
}

/** Session endpoints. Callers of `login`, `logout` and `me` show their own errors. */
@Injectable({ providedIn: 'root' })
export class AuthApi {
  private readonly http = inject(HttpClient);

  /** Sets the XSRF-TOKEN cookie that Angular echoes in X-XSRF-TOKEN on mutating requests. */
  csrf(): Observable<void> {
    return this.http.get<void>('/api/auth/csrf', { context: handledByCaller() });
  }

  me(): Observable<Me> {
    return this.http.get<Me>('/api/me', { context: handledByCaller() });
  }

  /** Who is signed in, or `null`; answers 200 either way so a signed-out start is no error. */
  session(): Observable<{ me: Me | null }> {
    return this.http.get<{ me: Me | null }>('/api/auth/session', { context: handledByCaller() });
  }

  login(credentials: Credentials): Observable<Me> {
    return this.http.post<Me>('/api/auth/login', credentials, { context: handledByCaller() });
  }

  logout(): Observable<void> {
    return this.http.post<void>('/api/auth/logout', null, { context: handledByCaller() });
  }

  setActiveOrganisation(organisationId: string): Observable<Me> {
    return this.http.put<Me>('/api/me/active-organisation', { organisationId });
  }
}
