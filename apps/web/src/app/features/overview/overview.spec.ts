import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';

import { Auth } from '../../core/auth/auth';
import { meAs } from '../../testing/me-fixtures';
import { Overview } from './overview';

describe('Overview', () => {
  async function renderFor(role: Parameters<typeof meAs>[0]): Promise<string> {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    const http = TestBed.inject(HttpTestingController);
    const restored = TestBed.inject(Auth).restore();
    http.expectOne('/api/auth/csrf').flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/auth/session').flush({ me: meAs(role) });
    await restored;
    const fixture = TestBed.createComponent(Overview);
    await fixture.whenStable();
    return (fixture.nativeElement as HTMLElement).textContent ?? '';
  }

  it('names the organisation and the role, and says what the role may do', async () => {
    const text = await renderFor('auditor');
    expect(text).toContain('Northmoor Energy');
    expect(text).toContain('Auditor');
    expect(text).toContain('You cannot change anything.');
    expect(text).toContain('Read the audit trail of every change');
    expect(text).not.toContain('Import monitoring data from data logger exports');
  });

  it('lists the import permission for an officer', async () => {
    expect(await renderFor('officer')).toContain('Import monitoring data from data logger exports');
  });

  it('says the figures support, not replace, regulatory reporting', async () => {
    const text = await renderFor('manager');
    expect(text).toContain("support, and do not replace, the operator's own regulatory reporting");
    expect(text).toContain('the permit, local regulations and licensed professionals');
  });
});
