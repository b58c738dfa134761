import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';

import { MemberList } from '../../core/api/members-api';
import { Members } from './members';

const memberList: MemberList = {
  items: [
    { userId: 'u1', name: 'Ada Marsh', email: 'admin@northmoor.example', role: 'admin', joinedAt: '2026-01-05T09:00:00Z' },
    { userId: 'u2', name: 'Olu Fenwick', email: 'officer@northmoor.example', role: 'officer', joinedAt: '2026-02-11T09:00:00Z' },
    { userId: 'u3', name: 'Mira Holt', email: 'manager@northmoor.example', role: 'manager', joinedAt: '2026-03-20T09:00:00Z' },
    { userId: 'u4', name: 'Bea Aldous', email: 'auditor@northmoor.example', role: 'auditor', joinedAt: '2026-04-01T09:00:00Z' },
  ],
  total: 4,
};

async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}

describe('Members', () => {
  let fixture: ComponentFixture<Members>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Members);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await settle(fixture);
  });

  afterEach(() => http.verify());

  async function loadMembers(list: MemberList = memberList): Promise<void> {
    http.expectOne('/api/members').flush(list);
    await settle(fixture);
  }

  async function nameColumn(): Promise<string[]> {
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getRows();
    return Promise.all(rows.map(async (row) => (await row.getCellTextByColumnName())['name']));
  }

  it('lists the members sorted by name', async () => {
    await loadMembers();
    expect(await nameColumn()).toEqual(['Ada Marsh', 'Bea Aldous', 'Mira Holt', 'Olu Fenwick']);
    const table = await loader.getHarness(MatTableHarness);
    const [first] = await table.getRows();
    expect(await first.getCellTextByColumnName()).toEqual(
      expect.objectContaining({ email: 'admin@northmoor.example', role: 'Administrator' }),
    );
  });

  it('filters by name, e-mail or role label', async () => {
    await loadMembers();
    const filter = await loader.getHarness(MatInputHarness.with({ placeholder: 'Name, e-mail or role' }));

    await filter.setValue('auditor');
    expect(await nameColumn()).toEqual(['Bea Aldous']);

    await filter.setValue('plant manager');
    expect(await nameColumn()).toEqual(['Mira Holt']);

    await filter.setValue('HOLT');
    expect(await nameColumn()).toEqual(['Mira Holt']);
  });

  it('says so when no member matches the filter', async () => {
    await loadMembers();
    const filter = await loader.getHarness(MatInputHarness.with({ placeholder: 'Name, e-mail or role' }));
    await filter.setValue('nobody-like-this');

    expect(await nameColumn()).toEqual([]);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('No member matches “nobody-like-this”.');
  });

  it('sorts by a column when its header is clicked', async () => {
    await loadMembers();
    const sort = await loader.getHarness(MatSortHarness);
    const [, emailHeader] = await sort.getSortHeaders();

    await emailHeader.click();
    expect(await nameColumn()).toEqual(['Ada Marsh', 'Bea Aldous', 'Mira Holt', 'Olu Fenwick']);

    await emailHeader.click();
    // Descending by e-mail: officer, manager, auditor, admin.
    expect(await nameColumn()).toEqual(['Olu Fenwick', 'Mira Holt', 'Bea Aldous', 'Ada Marsh']);
  });
});
