import { actions, can, permissionMap, permissionsFor, roles } from './permissions';

// The role descriptions these checks follow are in DESIGN.md §1 (roles).
describe('the permission map', () => {
  it('gives the admin every action', () => {
    expect(permissionsFor('admin')).toEqual([...actions]);
  });

  it('gives the officer everything except team, single sign-on and billing management', () => {
    const missing = actions.filter((action) => !can('officer', action));
    expect(missing.sort()).toEqual(['billing:manage', 'members:manage', 'sso:manage']);
  });

  it('lets the manager read site figures and acknowledge exceedances, and change nothing else', () => {
    expect(can('manager', 'exceedance:ack')).toBe(true);
    expect(can('manager', 'data:read')).toBe(true);
    expect(can('manager', 'audit:read')).toBe(false);
    expect(permissionsFor('manager').filter((a) => !a.endsWith(':read'))).toEqual(['exceedance:ack']);
  });

  it('gives the auditor every read action, including the audit trail, and nothing else', () => {
    expect(permissionsFor('auditor')).toEqual(actions.filter((a) => a.endsWith(':read')));
    expect(can('auditor', 'audit:read')).toBe(true);
  });

  it('names only known actions for every role', () => {
    for (const role of roles) {
      for (const action of permissionMap[role]) expect(actions).toContain(action);
    }
  });
});
