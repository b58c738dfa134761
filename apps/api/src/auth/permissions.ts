/**
 * THE permission map: which role may do which action. Every route names one action (or
 * 'public' / 'authenticated'); nothing else in the code decides who may do what.
 *
 * Adding an action: add it to `actions`, then to the roles that hold it. Read actions end in
 * `:read`; an auditor holds every read action and nothing else, and the route registry refuses
 * to start if a mutating route names an action the auditor holds.
 */
export const actions = [
  'org:read',
  'members:read',
  'members:manage',
  'audit:read',
  'site:read',
  'site:write',
  'data:read',
  'data:import',
  'data:correct',
  'report:read',
  'report:signoff',
  'exceedance:ack',
  'sso:manage',
  'billing:manage',
] as const;

export type Action = (typeof actions)[number];

export const roles = ['admin', 'officer', 'manager', 'auditor'] as const;

export type Role = (typeof roles)[number];

const readActions = actions.filter((action) => action.endsWith(':read'));

const adminOnly: readonly Action[] = ['members:manage', 'sso:manage', 'billing:manage'];

export const permissionMap: Readonly<Record<Role, readonly Action[]>> = {
  // Tenant administrator: everything.
  admin: [...actions],
  // Compliance officer: the whole compliance job, but not the team, SSO or billing.
  officer: actions.filter((action) => !adminOnly.includes(action)),
  // Plant manager: sees the site's figures and acknowledges exceedances.
  manager: ['org:read', 'site:read', 'data:read', 'report:read', 'exceedance:ack'],
  // Auditor: reads everything, including the audit trail; changes nothing.
  auditor: readActions,
};

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (roles as readonly string[]).includes(value);
}

export function isAction(value: unknown): value is Action {
  return typeof value === 'string' && (actions as readonly string[]).includes(value);
}

/** The actions a role holds, in the order of `actions`. */
export function permissionsFor(role: Role): Action[] {
  const held = new Set(permissionMap[role]);
  return actions.filter((action) => held.has(action));
}

export function can(role: Role, action: Action): boolean {
  return permissionMap[role].includes(action);
}
