import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { EnvironmentInjector, runInInjectionContext } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, Router, RouterStateSnapshot, UrlTree, provideRouter } from '@angular/router';

import { Me } from '../api/auth-api';
import { meAs } from '../../testing/me-fixtures';
import { Auth } from './auth';
import { authGuard, permissionGuard, safeReturnUrl } from './guards';

describe('route guards', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function restoreSession(me: Me | null): Promise<void> {
    const restored = TestBed.inject(Auth).restore();
    http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/auth/session').flush({ me });
    await restored;
  }

  function run(guard: typeof authGuard, url = '/members'): ReturnType<typeof authGuard> {
    return runInInjectionContext(TestBed.inject(EnvironmentInjector), () =>
      guard({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot),
    );
  }

  function serialise(result: ReturnType<typeof authGuard>): string {
    expect(result).toBeInstanceOf(UrlTree);
    return TestBed.inject(Router).serializeUrl(result as UrlTree);
  }

  describe('authGuard', () => {
    it('sends a signed-out visitor to sign-in with the page to come back to', async () => {
      await restoreSession(null);
      expect(serialise(run(authGuard, '/audit-log?entity=membership'))).toBe(
        '/sign-in?returnUrl=%2Faudit-log%3Fentity%3Dmembership',
      );
    });

    it('lets a signed-in person through', async () => {
      await restoreSession(meAs('auditor'));
      expect(run(authGuard)).toBe(true);
    });
  });

  describe('permissionGuard', () => {
    it('opens the page when the role holds the permission', async () => {
      await restoreSession(meAs('auditor'));
      expect(run(permissionGuard('audit:read'))).toBe(true);
    });

    it('turns a manager away from Members to the overview', async () => {
      await restoreSession(meAs('manager'));
      expect(serialise(run(permissionGuard('members:read')))).toBe('/overview');
    });
  });

  describe('safeReturnUrl', () => {
    it.each([
      ['/members', '/members'],
      ['/audit-log?entity=stack', '/audit-log?entity=stack'],
      ['https://elsewhere.example/', '/overview'],
      ['//elsewhere.example', '/overview'],
      ['/\\elsewhere.example', '/overview'],
      ['/sign-in', '/overview'],
      [undefined, '/overview'],
    ])('turns %p into %p', (input, expected) => {
      expect(safeReturnUrl(input)).toBe(expected);
    });
  });
});
