import argon2 from 'argon2';
import type { Knex } from 'knex';

// The demo scenario. Invented organisations and people; any likeness is accidental.
// Idempotent: fixed organisation ids, and every insert skips what already exists.
// Runs as the schema owner: organisations and memberships FORCE row-level security, so each
// organisation's rows are written inside a transaction that sets app.tenant_id to it.

export const demoPassword = 'flueledger-demo';

interface DemoOrganisation {
  id: string;
  name: string;
  slug: string;
  members: { email: string; name: string; role: 'admin' | 'officer' | 'manager' | 'auditor' }[];
}

const organisations: DemoOrganisation[] = [
  {
    id: '4f1c2a7e-3b5d-4c8e-9a10-6d2e8b7c1a01',
    name: 'Northmoor Paper Mill Ltd',
    slug: 'northmoor',
    members: [
      { email: 'admin@northmoor.example', name: 'Alex Hartley', role: 'admin' },
      { email: 'officer@northmoor.example', name: 'Priya Okafor', role: 'officer' },
      { email: 'manager@northmoor.example', name: 'Sam Whitcombe', role: 'manager' },
      { email: 'auditor@northmoor.example', name: 'Jordan Lindqvist', role: 'auditor' },
    ],
  },
  {
    id: '8a3d5e21-7c4b-4f6a-b2d9-0e1f3c5a7b02',
    name: 'Red Mesa Power Cooperative',
    slug: 'redmesa',
    members: [
      { email: 'admin@redmesa.example', name: 'Maria Castillo', role: 'admin' },
      // The Northmoor officer audits Red Mesa: one person, two organisations, two roles.
      { email: 'officer@northmoor.example', name: 'Priya Okafor', role: 'auditor' },
    ],
  },
];

export async function seed(knex: Knex): Promise<void> {
  let passwordHash: string | undefined;
  const userIds = new Map<string, string>();

  for (const organisation of organisations) {
    for (const member of organisation.members) {
      if (userIds.has(member.email)) continue;
      const existing = await knex('users').where({ email: member.email }).first('id');
      if (existing) {
        userIds.set(member.email, existing.id);
        continue;
      }
      passwordHash ??= await argon2.hash(demoPassword, { type: argon2.argon2id });
      const [created] = await knex('users')
        .insert({ email: member.email, name: member.name, password_hash: passwordHash, is_demo: true })
        .onConflict('email')
        .ignore()
        .returning('id');
      userIds.set(member.email, created?.id ?? (await knex('users').where({ email: member.email }).first('id')).id);
    }
  }

  for (const organisation of organisations) {
    await knex.transaction(async (trx) => {
      await trx.raw("select set_config('app.tenant_id', ?, true)", [organisation.id]);
      await trx('organisations')
        .insert({ id: organisation.id, name: organisation.name, slug: organisation.slug })
        .onConflict('id')
        .ignore();
      for (const member of organisation.members) {
        await trx('memberships')
          .insert({ tenant_id: organisation.id, user_id: userIds.get(member.email), role: member.role })
          .onConflict(['tenant_id', 'user_id'])
          .ignore();
      }
    });
  }
}
