import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatTableHarness } from '@angular/material/table/testing';

import { AuditEntry, AuditLogPage } from '../../core/api/audit-log-api';
import { AuditLog } from './audit-log';

function entry(index: number): AuditEntry {
  return {
    id: index,
    at: '2026-11-30T10:00:00Z',
    actor: { id: 'u1', name: 'Ada Marsh', email: 'admin@northmoor.example' },
    action: 'membership.role_changed',
    entity: 'membership',
    entityId: `m${index}`,
    before: { role: 'manager' },
    after: { role: 'officer' },
  };
}

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

describe('AuditLog', () => {
  let fixture: ComponentFixture<AuditLog>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(AuditLog);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
  });

  afterEach(() => http.verify());

  async function answer(expectedParams: Record<string, string>, page: AuditLogPage): Promise<void> {
    const request = http.expectOne((req) => req.url === '/api/audit-log');
    const params = Object.fromEntries(request.request.params.keys().map((key) => [key, request.request.params.get(key)]));
    expect(params).toEqual(expectedParams);
    request.flush(page);
    await settle(fixture);
  }

  it('shows the first page with who did what and what changed', async () => {
    await answer({ limit: '25', offset: '0' }, { items: [entry(1), entry(2)], total: 2 });

    const rows = await (await loader.getHarness(MatTableHarness)).getRows();
    expect(rows).toHaveLength(2);
    const cells = await rows[0].getCellTextByColumnName();
    expect(cells['actor']).toContain('Ada Marsh');
    // Plain words first, the exact key beside them for citing the entry.
    expect(cells['action']).toBe('Membership role changedmembership.role_changed');
    expect(cells['changes']).toContain('role: manager → officer');
  });

  it('asks the API for the next page with limit and offset', async () => {
    await answer({ limit: '25', offset: '0' }, { items: Array.from({ length: 25 }, (_, i) => entry(i)), total: 60 });
    const paginator = await loader.getHarness(MatPaginatorHarness);
    expect(await paginator.getRangeLabel()).toBe('1 – 25 of 60');

    await paginator.goToNextPage();
    await answer({ limit: '25', offset: '25' }, { items: Array.from({ length: 25 }, (_, i) => entry(25 + i)), total: 60 });
    expect(await paginator.getRangeLabel()).toBe('26 – 50 of 60');
  });

  it('filters by entity from the first page and says when nothing matches', async () => {
    await answer({ limit: '25', offset: '0' }, { items: [entry(1)], total: 1 });
    await (await loader.getHarness(MatInputHarness.with({ placeholder: 'e.g. membership' }))).setValue('stack');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Filter' }))).click();

    await answer({ limit: '25', offset: '0', entity: 'stack' }, { items: [], total: 0 });
    expect(await (await loader.getHarness(MatTableHarness)).getRows()).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No audit entries about “stack”.');
  });

  it('explains an empty audit log', async () => {
    await answer({ limit: '25', offset: '0' }, { items: [], total: 0 });
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No audit entries yet.');
  });
});
