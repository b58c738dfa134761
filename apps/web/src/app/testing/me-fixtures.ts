import { Me, Role } from '../core/api/auth-api';

/*
 * Invented people and organisations for web tests. Permission lists follow DESIGN.md §1:
 * admin everything, officer sets up and imports, manager watches and acknowledges, auditor
 * reads only.
 */

export const northmoor = { id: 'org-northmoor', name: 'Northmoor Energy', slug: 'northmoor' };
export const eastfield = { id: 'org-eastfield', name: 'Eastfield Kilns', slug: 'eastfield' };

// Mirrors the API's permission map (apps/api/src/auth/permissions.ts).
const permissionsByRole: Record<Role, string[]> = {
  admin: [
    'org:read', 'members:read', 'members:manage', 'audit:read', 'site:read', 'site:write', 'data:read',
    'data:import', 'data:correct', 'report:read', 'report:signoff', 'exceedance:ack', 'sso:manage', 'billing:manage',
  ],
  officer: [
    'org:read', 'members:read', 'audit:read', 'site:read', 'site:write', 'data:read', 'data:import',
    'data:correct', 'report:read', 'report:signoff', 'exceedance:ack',
  ],
  manager: ['org:read', 'site:read', 'data:read', 'report:read', 'exceedance:ack'],
  auditor: ['org:read', 'members:read', 'audit:read', 'site:read', 'data:read', 'report:read'],
};

export function meAs(role: Role, options: { organisations?: Me['organisations'] } = {}): Me {
  return {
    user: { id: `user-${role}`, email: `${role}@northmoor.example`, name: `Demo ${role[0].toUpperCase()}${role.slice(1)}` },
    organisation: northmoor,
    role,
    permissions: permissionsByRole[role],
    organisations: options.organisations ?? [{ ...northmoor, role }],
  };
}
