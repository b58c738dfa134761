import { HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { provideRouter } from '@angular/router';

import { ERROR_MESSAGE_SHOWN_BY_CALLER } from '../../../core/api/api-error';
import { Auth } from '../../../core/auth/auth';
import { meAs } from '../../../testing/me-fixtures';
import { site, stack } from '../../review/testing/review-fixtures';
import { PROGRESS_POLL_INTERVAL_MS } from '../progress-polling';
import { draftFixture, previewFixture } from '../testing/import-fixtures';
import { ImportPage } from './import-page';

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

function text(fixture: ComponentFixture<unknown>): string {
  return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
}

// The whole page (four steps and the history) compiles in JIT on first use: slow on a busy machine.
jest.setTimeout(30_000);

describe('ImportPage', () => {
  let fixture: ComponentFixture<ImportPage>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeEach(async () => {
    const me = meAs('officer');
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PROGRESS_POLL_INTERVAL_MS, useValue: 3_600_000 },
        { provide: Auth, useValue: { me: signal(me), can: (permission: string) => me.permissions.includes(permission) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ImportPage);
    fixture.componentRef.setInput('stackId', 'stack-b2');
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
    http.expectOne('/api/stacks/stack-b2').flush(stack);
    await settle(fixture);
    const siteDetail = { ...site, units: [], stacks: [stack], fuels: [], counts: {} };
    http.match('/api/sites/site-1').forEach((request) => request.flush(siteDetail));
    http.match((request) => request.url === '/api/sites').forEach((request) => request.flush({ items: [site], total: 1 }));
    await settle(fixture);
    http.match('/api/sites/site-1').forEach((request) => request.flush(siteDetail));
    http.match((request) => request.url === '/api/stacks/stack-b2/imports').forEach((request) => request.flush({ items: [], total: 0 }));
    await settle(fixture);
  });

  afterEach(() => http.verify());

  function chooseFile(name: string): void {
    const input = (fixture.nativeElement as HTMLElement).querySelector<HTMLInputElement>('input[type="file"]')!;
    const file = new File(['Time,NOx mg/Nm3 dry\n'], name, { type: 'text/csv' });
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
  }

  it('walks from upload with its progress bar through mapping and preview to "Nothing new" for a file already stored', async () => {
    chooseFile('boiler2-2026-11.csv');
    await settle(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: /^(upload\s*)?Upload$/i }))).click();

    const upload = http.expectOne({ method: 'POST', url: '/api/stacks/stack-b2/imports' });
    expect((upload.request.body as FormData).get('file')).toBeInstanceOf(File);
    // A refusal is shown next to the file field, not a second time in the app-wide snackbar.
    expect(upload.request.context.get(ERROR_MESSAGE_SHOWN_BY_CALLER)).toBe(true);
    upload.event({ type: HttpEventType.UploadProgress, loaded: 40, total: 100 });
    await settle(fixture);
    expect(await (await loader.getHarness(MatProgressBarHarness)).getValue()).toBe(40);
    expect(text(fixture)).toContain('Uploading boiler2-2026-11.csv: 40 %');

    upload.flush(draftFixture({ alreadyImported: { importId: 'imp-0', committedAt: '2026-11-30T09:00:00Z' } }), {
      status: 201,
      statusText: 'Created',
    });
    await settle(fixture);
    expect(text(fixture)).toContain('This file was already imported on 30 Nov 2026');

    await (await loader.getHarness(MatButtonHarness.with({ text: /Confirm mapping/ }))).click();
    http.expectOne('/api/imports/imp-1/mapping').flush(draftFixture({ state: 'mapped' }));
    await settle(fixture);

    http.expectOne('/api/imports/imp-1/preview').flush(previewFixture({ overlap: { new: 0, unchanged: 86_398, conflicting: 0 } }));
    await settle(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: /Commit import/ }))).click();
    http.expectOne('/api/imports/imp-1/commit').flush({ inserted: 0, unchanged: 86_398, superseded: 0, conflicts: 0, nothingNew: true });
    await settle(fixture);

    expect(text(fixture)).toContain('Nothing new');
    expect(text(fixture)).toContain('86,398 readings unchanged');
    // The history is fetched again so the new entry shows.
    http.expectOne((request) => request.url === '/api/stacks/stack-b2/imports').flush({ items: [], total: 0 });
    await settle(fixture);
  });

  it('refuses a file that is neither a workbook nor a CSV before uploading', async () => {
    chooseFile('permit.pdf');
    await settle(fixture);
    expect(text(fixture)).toContain('Choose an Excel workbook (.xlsx) or a CSV file (.csv).');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: /Upload$/ }))).isDisabled()).toBe(true);
  });
});
