import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import { Role } from './auth-api';

export interface Member {
  userId: string;
  email: string;
  name: string;
  role: Role;
  /** ISO 8601 timestamp. */
  joinedAt: string;
}

export interface MemberList {
  items: Member[];
  total: number;
}

/** Members of the active organisation (needs `members:read`). */
@Injectable({ providedIn: 'root' })
export class MembersApi {
  private readonly http = inject(HttpClient);

  list(): Observable<MemberList> {
    return this.http.get<MemberList>('/api/members');
  }
}
