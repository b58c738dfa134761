import { HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';

import { AuthApi, Credentials, Me, Permission } from '../api/auth-api';

/**
 * The signed-in person as the rest of the app sees it. `me` is null when signed out; every
 * permission check in the UI reads it, and the API checks again on every request.
 */
@Injectable({ providedIn: 'root' })
export class Auth {
  private readonly api = inject(AuthApi);
  private readonly state = signal<Me | null>(null);

  readonly me = this.state.asReadonly();
  readonly signedIn = computed(() => this.state() !== null);
  private readonly permissionSet = computed(() => new Set(this.state()?.permissions ?? []));

  can(permission: Permission): boolean {
    return this.permissionSet().has(permission);
  }

  /**
   * Runs once at start-up: fetches the CSRF cookie and asks who is signed in (a signed-out
   * answer is a 200 with `me: null`, not an error). An unreachable server leaves the app signed out; the sign-in page then explains any problem.
   */
  async restore(): Promise<void> {
    const [, me] = await Promise.all([this.refreshCsrf(), this.fetchMe()]);
    this.state.set(me);
  }

  async signIn(credentials: Credentials): Promise<Me> {
    const me = await firstValueFrom(this.api.login(credentials));
    this.state.set(me);
    // The server may bind the token to the new session it starts at sign-in.
    await this.refreshCsrf();
    return me;
  }

  async signOut(): Promise<void> {
    try {
      await firstValueFrom(this.api.logout());
    } catch {
      // Signing out must always work on this side; an already-ended session answers 401.
    }
    this.state.set(null);
    await this.refreshCsrf();
  }

  async switchOrganisation(organisationId: string): Promise<Me> {
    const me = await firstValueFrom(this.api.setActiveOrganisation(organisationId));
    this.state.set(me);
    return me;
  }

  /** The server said the session is gone (401): forget it without another request. */
  forgetSession(): void {
    this.state.set(null);
  }

  private async fetchMe(): Promise<Me | null> {
    try {
      return (await firstValueFrom(this.api.session())).me;
    } catch (error) {
      if (error instanceof HttpErrorResponse) return null;
      throw error;
    }
  }

  private async refreshCsrf(): Promise<void> {
    try {
      await firstValueFrom(this.api.csrf(), { defaultValue: undefined });
    } catch {
      // Without the cookie the next mutating request fails with a clear 403 from the API.
    }
  }
}
