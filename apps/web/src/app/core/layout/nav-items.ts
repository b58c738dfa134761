import { InjectionToken } from '@angular/core';

import { Permission } from '../api/auth-api';

export interface NavItem {
  path: string;
  label: string;
  /** A Material Symbols ligature name. */
  icon: string;
  /** Shown only when the active role holds this permission; undefined means everyone. */
  permission?: Permission;
}

/**
 * The side navigation, in order. Each entry names the permission its page's guard checks, so
 * a person never sees a link that would only lead to a refusal. Only pages that exist belong
 * here.
 */
export const defaultNavItems: readonly NavItem[] = [
  { path: '/overview', label: 'Overview', icon: 'home' },
  { path: '/sites', label: 'Sites', icon: 'factory', permission: 'site:read' },
  { path: '/review', label: 'Data review', icon: 'monitoring', permission: 'data:read' },
  { path: '/imports', label: 'Import', icon: 'upload_file', permission: 'data:import' },
  { path: '/members', label: 'Members', icon: 'group', permission: 'members:read' },
  { path: '/audit-log', label: 'Audit log', icon: 'history', permission: 'audit:read' },
];

export const NAV_ITEMS = new InjectionToken<readonly NavItem[]>('NAV_ITEMS', {
  providedIn: 'root',
  factory: () => defaultNavItems,
});
