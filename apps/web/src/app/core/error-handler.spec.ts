import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSnackBarHarness } from '@angular/material/snack-bar/testing';
import { Router, provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { handledByCaller, messageShownByCaller } from './api/api-error';
import { Auth } from './auth/auth';
import { errorInterceptor } from './error-handler';
import { meAs } from '../testing/me-fixtures';

@Component({ template: '' })
class Page {}

async function settle(): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
}

describe('errorInterceptor', () => {
  let http: HttpTestingController;
  let client: HttpClient;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'members', component: Page },
          { path: 'sign-in', component: Page },
        ]),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    client = TestBed.inject(HttpClient);
    await TestBed.inject(Router).navigateByUrl('/members');
  });

  afterEach(() => {
    http.verify();
    document.querySelectorAll('.cdk-overlay-container').forEach((element) => element.remove());
  });

  async function snackBarMessages(): Promise<string[]> {
    const fixture = TestBed.createComponent(Page);
    const bars = await TestbedHarnessEnvironment.documentRootLoader(fixture).getAllHarnesses(MatSnackBarHarness);
    return Promise.all(bars.map((bar) => bar.getMessage()));
  }

  it("shows the API's error message in a snackbar", async () => {
    const result = firstValueFrom(client.get('/api/members')).catch((error: unknown) => error);
    http.expectOne('/api/members').flush(
      { error: { code: 'conflict', message: 'That site name is already used.' } },
      { status: 409, statusText: 'Conflict' },
    );
    await result;
    await settle();

    expect(await snackBarMessages()).toEqual(['That site name is already used.']);
  });

  it('sends the person to sign-in when the session has ended', async () => {
    const auth = TestBed.inject(Auth);
    const restored = auth.restore();
    http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/auth/session').flush({ me: meAs('officer') });
    await restored;

    const result = firstValueFrom(client.get('/api/members')).catch((error: unknown) => error);
    http.expectOne('/api/members').flush(
      { error: { code: 'unauthenticated', message: 'Sign in first.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await result;
    await settle();

    expect(auth.signedIn()).toBe(false);
    expect(TestBed.inject(Router).url).toBe('/sign-in?returnUrl=%2Fmembers');
  });

  it('leaves errors alone when the caller handles them', async () => {
    const result = firstValueFrom(client.post('/api/auth/login', {}, { context: handledByCaller() })).catch(
      (error: unknown) => error,
    );
    http.expectOne('/api/auth/login').flush(
      { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await result;
    await settle();

    expect(await snackBarMessages()).toEqual([]);
    expect(TestBed.inject(Router).url).toBe('/members');
  });

  it('shows no snackbar when the caller shows the message itself', async () => {
    const result = firstValueFrom(client.post('/api/stacks/s1/imports', {}, { context: messageShownByCaller() })).catch((error: unknown) => error);
    http.expectOne('/api/stacks/s1/imports').flush(
      { error: { code: 'corrupt_workbook', message: 'The workbook cannot be read.' } },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await result;
    await settle();

    expect(await snackBarMessages()).toEqual([]);
  });

  it('still sends the person to sign-in when the caller shows the message itself', async () => {
    const result = firstValueFrom(client.post('/api/stacks/s1/imports', {}, { context: messageShownByCaller() })).catch((error: unknown) => error);
    http.expectOne('/api/stacks/s1/imports').flush(
      { error: { code: 'unauthenticated', message: 'Sign in first.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await result;
    await settle();

    expect(TestBed.inject(Router).url).toBe('/sign-in?returnUrl=%2Fmembers');
  });
});
