import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';

import { errorInterceptor } from '../../core/error-handler';
import { meAs } from '../../testing/me-fixtures';
import { SignIn } from './sign-in';

@Component({ template: '<p>destination</p>' })
class Destination {}

/** Lets promise chains and the zoneless scheduler run to completion. */
async function settle(harness: RouterTestingHarness): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await harness.fixture.whenStable();
}

describe('SignIn', () => {
  let harness: RouterTestingHarness;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [
            { path: 'sign-in', component: SignIn },
            { path: 'members', component: Destination },
            { path: 'overview', component: Destination },
          ],
          withComponentInputBinding(),
        ),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create('/sign-in?returnUrl=%2Fmembers');
    loader = TestbedHarnessEnvironment.loader(harness.fixture);
  });

  afterEach(() => http.verify());

  async function fillIn(email: string, password: string): Promise<void> {
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=email]' }))).setValue(email);
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=password]' }))).setValue(password);
  }

  async function submit(): Promise<void> {
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
  }

  async function errorsOf(label: string): Promise<string[]> {
    return (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }))).getTextErrors();
  }

  function pageText(): string {
    return (harness.routeNativeElement as HTMLElement).textContent ?? '';
  }

  describe('when the form is submitted empty', () => {
    it('says what is missing and sends nothing', async () => {
      await submit();

      expect(await errorsOf('E-mail')).toEqual(['Enter your e-mail address.']);
      expect(await errorsOf('Password')).toEqual(['Enter your password.']);
      http.expectNone('/api/auth/login');
    });
  });

  describe('when the e-mail address is malformed', () => {
    it('asks for a valid address and sends nothing', async () => {
      await fillIn('not-an-address', 'secret');
      await submit();

      expect(await errorsOf('E-mail')).toEqual(['Enter a valid e-mail address, like name@example.com.']);
      expect(await errorsOf('Password')).toEqual([]);
      http.expectNone('/api/auth/login');
    });
  });

  describe('when the password is wrong', () => {
    it('shows "E-mail or password is wrong." and clears the password', async () => {
      await fillIn('officer@northmoor.example', 'not-the-password');
      await submit();

      const request = http.expectOne('/api/auth/login');
      expect(request.request.method).toBe('POST');
      expect(request.request.body).toEqual({ email: 'officer@northmoor.example', password: 'not-the-password' });
      request.flush(
        { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } },
        { status: 401, statusText: 'Unauthorized' },
      );
      await settle(harness);

      expect(pageText()).toContain('E-mail or password is wrong.');
      const password = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName=password]' }));
      expect(await password.getValue()).toBe('');
      // The emptied field is not flagged as a second mistake.
      expect(await errorsOf('Password')).toEqual([]);
      expect(TestBed.inject(Router).url).toBe('/sign-in?returnUrl=%2Fmembers');
    });
  });

  describe('when sign-in attempts are rate limited', () => {
    it('asks the person to wait', async () => {
      await fillIn('officer@northmoor.example', 'whatever');
      await submit();

      http.expectOne('/api/auth/login').flush(
        { error: { code: 'rate_limited', message: 'Too many requests.' } },
        { status: 429, statusText: 'Too Many Requests' },
      );
      await settle(harness);

      expect(pageText()).toContain('Too many sign-in attempts. Wait a few minutes, then try again.');
    });
  });

  describe('when the credentials are right', () => {
    it('signs in and goes to the page the person asked for', async () => {
      await fillIn('admin@northmoor.example', 'flueledger-demo');
      await submit();

      http.expectOne('/api/auth/login').flush(meAs('admin'));
      await settle(harness);
      // A fresh CSRF cookie for the new session.
      http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
      await settle(harness);

      expect(TestBed.inject(Router).url).toBe('/members');
      expect(pageText()).toContain('destination');
    });
  });
});
