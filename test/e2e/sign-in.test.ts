/**
 * Browser end-to-end: each demo role signs in and sees the navigation its permissions allow;
 * a wrong password shows an error; no console error (CSP violations included) and no request
 * leaves loopback.
 */
import { baseUrl, launch, signIn, type BrowserSession, type WatchedPage } from './browser';

let session: BrowserSession;
beforeAll(async () => {
  session = await launch();
});
afterAll(async () => {
  await session?.close();
});

async function navLabels(w: WatchedPage): Promise<string[]> {
  const nav = w.page.getByRole('navigation', { name: /main/i });
  await nav.waitFor();
  return (await nav.getByRole('link').allInnerTexts()).map((t) => t.replace(/^\S+\s+/, '').trim());
}

function expectClean(w: WatchedPage): void {
  expect(w.consoleErrors).toEqual([]);
  expect(w.externalRequests).toEqual([]);
}

describe('signing in', () => {
  it('shows an error for a wrong password and stays on the sign-in page', async () => {
    const w = await session.newPage();
    await signIn(w.page, 'officer@northmoor.example', 'not-the-password');
    const alert = w.page.getByRole('alert');
    await alert.waitFor({ timeout: 15_000 });
    expect(await alert.innerText()).toContain('E-mail or password is wrong.');
    expect(new URL(w.page.url()).pathname).toBe('/sign-in');
    // The 401 of the failed sign-in is logged by Chromium as a failed resource; nothing else may be.
    expect(w.consoleErrors.filter((e) => !/status of 401/.test(e))).toEqual([]);
    expect(w.externalRequests).toEqual([]);
    await w.context.close();
  });

  const roles: Array<{ email: string; role: string; sees: string[]; notSees: string[] }> = [
    { email: 'admin@northmoor.example', role: 'admin', sees: ['Overview', 'Members', 'Audit log'], notSees: [] },
    { email: 'officer@northmoor.example', role: 'officer', sees: ['Overview', 'Members', 'Audit log'], notSees: [] },
    { email: 'manager@northmoor.example', role: 'manager', sees: ['Overview'], notSees: ['Members', 'Audit log'] },
    { email: 'auditor@northmoor.example', role: 'auditor', sees: ['Overview', 'Members', 'Audit log'], notSees: [] },
  ];

  it.each(roles)('signs in as the $role and sees the navigation of that role', async ({ email, role, sees, notSees }) => {
    const w = await session.newPage();
    await signIn(w.page, email);
    await w.page.waitForURL(`${baseUrl()}/overview`, { timeout: 20_000 });
    const labels = await navLabels(w);
    for (const label of sees) expect(labels).toContain(label);
    for (const label of notSees) expect(labels).not.toContain(label);
    // The overview names the role in words of its own ("Administrator", "Environmental officer" …).
    expect((await w.page.locator('body').innerText()).toLowerCase()).toMatch(new RegExp(`your role here: [^·\\n]*${role}`));
    expectClean(w);
    await w.context.close();
  });

  it('refuses the members page to a manager who types its address', async () => {
    const w = await session.newPage();
    await signIn(w.page, 'manager@northmoor.example');
    await w.page.waitForURL(`${baseUrl()}/overview`, { timeout: 20_000 });
    await w.page.goto(`${baseUrl()}/members`);
    await w.page.waitForLoadState('networkidle');
    expect(new URL(w.page.url()).pathname).not.toBe('/members');
    expectClean(w);
    await w.context.close();
  });
});
