import { Permission, Role } from '../api/auth-api';

/** How each role is named on screen. */
export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  officer: 'Environmental officer',
  manager: 'Plant manager',
  auditor: 'Auditor',
};

/** What each role is for, in a sentence (DESIGN.md §1). */
export const roleSummaries: Record<Role, string> = {
  admin:
    'You run this organisation in FlueLedger: its members and their roles, sign-in settings and ' +
    'the subscription, as well as everything an environmental officer may do.',
  officer:
    'You set up sites, emission units, stacks, fuels, permits and limits; import monitoring data; ' +
    'correct data with a stated reason; prepare and sign off reports; and acknowledge exceedances.',
  manager:
    'You follow the dashboards of your sites, receive exceedance e-mails, and acknowledge and ' +
    'comment on exceedances.',
  auditor:
    'You may read reports, monitoring data and the audit trail. You cannot change anything.',
};

// Keyed by the API's actions (apps/api/src/auth/permissions.ts).
const permissionDescriptions: Record<string, string> = {
  'org:read': 'See this organisation and its settings',
  'members:read': 'See who belongs to the organisation and their roles',
  'members:manage': 'Invite members, change their roles and remove them',
  'audit:read': 'Read the audit trail of every change',
  'site:read': 'See sites, emission units, stacks, fuels, permits and limits',
  'site:write': 'Set up and change sites, emission units, stacks, fuels, permits and limits',
  'data:read': 'See monitoring data and calculated averages',
  'data:import': 'Import monitoring data from data logger exports',
  'data:correct': 'Invalidate, annotate or substitute data, with a stated reason',
  'report:read': 'Read compliance reports',
  'report:signoff': 'Sign off compliance reports',
  'exceedance:ack': 'Acknowledge and comment on exceedances',
  'sso:manage': 'Configure single sign-on',
  'billing:manage': 'Manage the subscription plan and invoices',
};

/** A plain sentence for a permission key; unknown keys read as "resource: action". */
export function describePermission(permission: Permission): string {
  return permissionDescriptions[permission] ?? permission.replace(':', ': ');
}
