import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { provideRouter } from '@angular/router';

import { Auth } from '../../core/auth/auth';
import { draftFixture } from '../imports/testing/import-fixtures';
import { settle, siteDetail } from '../sites/testing/setup-fixtures';
import { meAs } from '../../testing/me-fixtures';
import { Overview } from './overview';

describe('Overview', () => {
  let http: HttpTestingController;
  let fixture: ComponentFixture<Overview>;
  let loader: HarnessLoader;

  async function renderFor(role: Parameters<typeof meAs>[0]): Promise<string> {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    const restored = TestBed.inject(Auth).restore();
    http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/auth/session').flush({ me: meAs(role) });
    await restored;
    fixture = TestBed.createComponent(Overview);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    return text();
  }

  function text(): string {
    return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
  }

  /** One site with two stacks: "Main stack" holds an October import, "Bypass stack" nothing yet. */
  async function flushSites(): Promise<void> {
    const detail = siteDetail();
    const bypass = { ...detail.stacks[0], id: 'stack-2', name: 'Bypass stack' };
    http.expectOne((request) => request.url === '/api/sites').flush({ items: [detail], total: 1 });
    await settle(fixture);
    http.expectOne('/api/sites/site-1').flush({ ...detail, stacks: [...detail.stacks, bypass] });
    await settle(fixture);
    http.expectOne((request) => request.url === '/api/stacks/stack-1/imports').flush({
      items: [
        draftFixture({
          stackId: 'stack-1',
          fileName: 'main-2026-10.xlsx',
          state: 'committed',
          // A month of October in Berlin: the span ends where the last interval ends (1 Nov, 00:00 CET).
          span: { from: '2026-09-30T22:00:00Z', to: '2026-10-31T23:00:00Z' },
          committedAt: '2026-11-02T09:30:00Z',
        }),
      ],
      total: 1,
    });
    http.expectOne((request) => request.url === '/api/stacks/stack-2/imports').flush({ items: [], total: 0 });
    await settle(fixture);
  }

  async function linkTargets(): Promise<Record<string, string | null>> {
    const links = Array.from((fixture.nativeElement as HTMLElement).querySelectorAll<HTMLAnchorElement>('.start a'));
    return Object.fromEntries(links.map((a) => [a.getAttribute('aria-label') ?? (a.textContent ?? '').trim(), a.getAttribute('href')]));
  }

  it('names the organisation and the role, and says what the role may do', async () => {
    const page = await renderFor('auditor');
    expect(page).toContain('Northmoor Energy');
    expect(page).toContain('Auditor');
    expect(page).toContain('You cannot change anything.');
    expect(page).toContain('Read the audit trail of every change');
    expect(page).not.toContain('Import monitoring data from data logger exports');
  });

  it('lists the import permission for an officer', async () => {
    expect(await renderFor('officer')).toContain('Import monitoring data from data logger exports');
  });

  it('says the figures support, not replace, regulatory reporting', async () => {
    const page = await renderFor('manager');
    expect(page).toContain("support, and do not replace, the operator's own regulatory reporting");
    expect(page).toContain('the permit, local regulations and licensed professionals');
  });

  it('leads the officer to the latest import and to the stack still without data', async () => {
    await renderFor('officer');
    await flushSites();

    expect(text()).toContain('Latest import: main-2026-10.xlsx into Main stack, committed 2 Nov 2026, 10:30 CET');
    expect(text()).toContain('Data through 31 Oct 2026');
    expect(text()).not.toContain('1 Nov 2026');
    expect(text()).toContain('No data imported yet');
    const targets = await linkTargets();
    expect(targets['Review its data']).toBe('/review/stacks/stack-1');
    expect(targets['Data review of Main stack']).toBe('/review/stacks/stack-1');
    expect(targets['Import data for Bypass stack']).toBe('/imports/stacks/stack-2');
    expect(targets['Harbourside Mill']).toBe('/sites/site-1');
    // No review link for a stack without data: it would only show an empty month.
    expect(targets['Data review of Bypass stack']).toBeUndefined();
    http.verify();
  });

  it('leads the plant manager to the data review, with nothing to import or administer', async () => {
    await renderFor('manager');
    await flushSites();

    const buttons = await Promise.all((await loader.getAllHarnesses(MatButtonHarness.with({ ancestor: '.start' }))).map((b) => b.getText()));
    expect(buttons.some((label) => label.includes('Data review'))).toBe(true);
    expect(buttons.some((label) => label.includes('Import data'))).toBe(false);
    expect(buttons.some((label) => /Members|Audit log/.test(label))).toBe(false);
    // The latest import line is the officer's starting point, not the manager's.
    expect(text()).not.toContain('Latest import');
    expect(text()).toContain('No data imported yet');
    http.verify();
  });
});
