import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatNavListHarness } from '@angular/material/list/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { Router, provideRouter } from '@angular/router';

import { Me, Role } from '../api/auth-api';
import { Auth } from '../auth/auth';
import { errorInterceptor } from '../error-handler';
import { eastfield, meAs, northmoor } from '../../testing/me-fixtures';
import { NAV_ITEMS, NavItem } from './nav-items';
import { Shell } from './shell';

@Component({ template: '' })
class Destination {}

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

/*
 * The spec's own navigation (the app's list grows as pages are added): one page for everyone,
 * two read pages and one write page, to prove write links stay hidden from readers.
 */
const navItems: readonly NavItem[] = [
  { path: '/overview', label: 'Overview', icon: 'home' },
  { path: '/members', label: 'Members', icon: 'group', permission: 'members:read' },
  { path: '/audit-log', label: 'Audit log', icon: 'history', permission: 'audit:read' },
  { path: '/import', label: 'Import data', icon: 'upload', permission: 'data:import' },
];

describe('Shell', () => {
  let http: HttpTestingController;

  function configure(): void {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([
          { path: 'overview', component: Destination },
          { path: 'members', component: Destination },
          { path: 'audit-log', component: Destination },
          { path: 'import', component: Destination },
          { path: 'sign-in', component: Destination },
        ]),
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        { provide: NAV_ITEMS, useValue: navItems },
      ],
    });
    http = TestBed.inject(HttpTestingController);
  }

  /** Signs in the way the app does at start-up: the session probe answers with `me`. */
  async function startSignedInAs(me: Me): Promise<{ fixture: ComponentFixture<Shell>; loader: HarnessLoader }> {
    const restored = TestBed.inject(Auth).restore();
    http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/auth/session').flush({ me });
    await restored;
    const fixture = TestBed.createComponent(Shell);
    await settle(fixture);
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture) };
  }

  async function navTitles(loader: HarnessLoader): Promise<string[]> {
    const items = await (await loader.getHarness(MatNavListHarness)).getItems();
    return Promise.all(items.map((item) => item.getTitle()));
  }

  afterEach(() => http.verify());

  describe('side navigation', () => {
    const cases: [Role, string[]][] = [
      ['admin', ['Overview', 'Members', 'Audit log', 'Import data']],
      ['officer', ['Overview', 'Members', 'Audit log', 'Import data']],
      ['manager', ['Overview']],
      ['auditor', ['Overview', 'Members', 'Audit log']],
    ];

    it.each(cases)('shows the %s the pages their permissions allow', async (role, expected) => {
      configure();
      const { loader } = await startSignedInAs(meAs(role));
      expect(await navTitles(loader)).toEqual(expected);
    });

    it('gives a manager no Members link', async () => {
      configure();
      const { loader } = await startSignedInAs(meAs('manager'));
      expect(await navTitles(loader)).not.toContain('Members');
    });

    it('gives the auditor no write page', async () => {
      configure();
      const { loader } = await startSignedInAs(meAs('auditor'));
      expect(await navTitles(loader)).not.toContain('Import data');
    });
  });

  describe('organisation switcher', () => {
    const twoOrganisations = [
      { ...northmoor, role: 'admin' as const },
      { ...eastfield, role: 'auditor' as const },
    ];

    it('is absent for a person in one organisation, who sees its name instead', async () => {
      configure();
      const { fixture, loader } = await startSignedInAs(meAs('officer'));
      expect(await loader.getAllHarnesses(MatSelectHarness)).toHaveLength(0);
      expect((fixture.nativeElement as HTMLElement).textContent).toContain('Northmoor Energy');
    });

    it('switches the active organisation with PUT /api/me/active-organisation', async () => {
      configure();
      const { fixture, loader } = await startSignedInAs(meAs('admin', { organisations: twoOrganisations }));
      const select = await loader.getHarness(MatSelectHarness);
      expect(await select.getValueText()).toContain('Northmoor Energy');

      await select.open();
      await select.clickOptions({ text: /Eastfield Kilns/ });

      const request = http.expectOne('/api/me/active-organisation');
      expect(request.request.method).toBe('PUT');
      expect(request.request.body).toEqual({ organisationId: 'org-eastfield' });
      request.flush({ ...meAs('auditor', { organisations: twoOrganisations }), organisation: eastfield });
      await settle(fixture);

      expect(TestBed.inject(Auth).me()?.organisation.name).toBe('Eastfield Kilns');
      expect(TestBed.inject(Router).url).toBe('/overview');
      // The new role there is auditor: the write page disappears.
      expect(await navTitles(loader)).toEqual(['Overview', 'Members', 'Audit log']);
    });

    it('shows the previous organisation again when the switch is refused', async () => {
      configure();
      const { fixture, loader } = await startSignedInAs(meAs('admin', { organisations: twoOrganisations }));
      const select = await loader.getHarness(MatSelectHarness);
      await select.open();
      await select.clickOptions({ text: /Eastfield Kilns/ });

      http
        .expectOne('/api/me/active-organisation')
        .flush({ error: { code: 'forbidden', message: 'You are not a member of that organisation.' } }, { status: 403, statusText: 'Forbidden' });
      await settle(fixture);

      expect(TestBed.inject(Auth).me()?.organisation.name).toBe('Northmoor Energy');
      expect(await select.getValueText()).toContain('Northmoor Energy');
    });
  });

  describe('user menu', () => {
    it('shows who is signed in and signs out', async () => {
      configure();
      const { fixture, loader } = await startSignedInAs(meAs('officer'));
      const menu = await loader.getHarness(MatMenuHarness.with({ triggerText: /Demo Officer/ }));
      await menu.open();

      expect(document.body.textContent).toContain('officer@northmoor.example');
      expect(document.body.textContent).toContain('Environmental officer · Northmoor Energy');

      await menu.clickItem({ text: /Sign out/ });
      http.expectOne('/api/auth/logout').flush(null, { status: 204, statusText: 'No Content' });
      await settle(fixture);
      http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
      await settle(fixture);

      expect(TestBed.inject(Auth).signedIn()).toBe(false);
      expect(TestBed.inject(Router).url).toBe('/sign-in');
    });
  });
});
