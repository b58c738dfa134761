import { randomBytes, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { hashPassword } from '../auth/passwords';
import { roles, type Role } from '../auth/permissions';

/** The password of every fixture user. */
export const testPassword = 'test-password-7f3a';

let passwordHash: Promise<string> | undefined;

/** One argon2 hash per test file: hashing is deliberately slow. */
function testPasswordHash(): Promise<string> {
  passwordHash ??= hashPassword(testPassword);
  return passwordHash;
}

export function randomSuffix(): string {
  return randomBytes(5).toString('hex');
}

export interface TestUser {
  id: string;
  email: string;
  name: string;
  password: string;
}

export interface TestMember extends TestUser {
  role: Role;
}

export interface TestOrganisation {
  id: string;
  name: string;
  slug: string;
  /** One member per role, created with the organisation. */
  users: Record<Role, TestMember>;
}

/** Creates a user (as the owner: the app role may not insert users). */
export async function createUser(
  owner: Knex,
  options: { email?: string; name?: string; isDemo?: boolean; disabled?: boolean } = {},
): Promise<TestUser> {
  const suffix = randomSuffix();
  const email = options.email ?? `user-${suffix}@test.example`;
  const name = options.name ?? `Test User ${suffix}`;
  const [row] = await owner('users')
    .insert({
      email,
      name,
      password_hash: await testPasswordHash(),
      is_demo: options.isDemo ?? false,
      disabled_at: options.disabled ? new Date() : null,
    })
    .returning('id');
  return { id: row.id, email, name, password: testPassword };
}

/** Runs owner work inside one organisation's row-level security scope. */
export function asOwnerInTenant<T>(owner: Knex, tenantId: string, work: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return owner.transaction(async (trx) => {
    await trx.raw("select set_config('app.tenant_id', ?, true)", [tenantId]);
    return work(trx);
  });
}

export async function addMembership(owner: Knex, tenantId: string, userId: string, role: Role): Promise<void> {
  await asOwnerInTenant(owner, tenantId, (trx) => trx('memberships').insert({ tenant_id: tenantId, user_id: userId, role }));
}

/**
 * Creates an organisation with a random slug and one user per role (admin, officer, manager,
 * auditor), so test files never share data and can run in parallel.
 */
export async function createOrganisation(owner: Knex, options: { name?: string } = {}): Promise<TestOrganisation> {
  const suffix = randomSuffix();
  const id = randomUUID();
  const name = options.name ?? `Test Organisation ${suffix}`;
  const slug = `test-${suffix}`;
  const users = {} as Record<Role, TestMember>;
  for (const role of roles) {
    const user = await createUser(owner, { email: `${role}-${suffix}@test.example`, name: `${role} ${suffix}` });
    users[role] = { ...user, role };
  }
  await asOwnerInTenant(owner, id, async (trx) => {
    await trx('organisations').insert({ id, name, slug });
    await trx('memberships').insert(roles.map((role) => ({ tenant_id: id, user_id: users[role].id, role })));
  });
  return { id, name, slug, users };
}
