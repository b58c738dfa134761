import { Routes } from '@angular/router';

import { permissionGuard } from '../../core/auth/guards';
import { unsavedChangesGuard } from '../../shared/unsaved-changes';

/**
 * Set-up pages, all under /sites (the parent route checks `site:read`). Pages that only add a
 * record need `site:write`; the other editors open read-only for people without it.
 */
export const siteRoutes: Routes = [
  {
    path: '',
    title: 'Sites · FlueLedger',
    loadComponent: () => import('./site-list/site-list').then((m) => m.SiteList),
  },
  {
    path: 'new',
    title: 'New site · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./site-form/site-form').then((m) => m.SiteForm),
  },
  {
    path: ':siteId',
    title: 'Site · FlueLedger',
    loadComponent: () => import('./site-page/site-page').then((m) => m.SitePage),
  },
  {
    path: ':siteId/edit',
    title: 'Edit site · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./site-form/site-form').then((m) => m.SiteForm),
  },
  {
    path: ':siteId/units/new',
    title: 'New emission unit · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./unit-form/unit-form').then((m) => m.UnitForm),
  },
  {
    path: ':siteId/units/:unitId',
    title: 'Emission unit · FlueLedger',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./unit-form/unit-form').then((m) => m.UnitForm),
  },
  {
    path: ':siteId/stacks/new',
    title: 'New stack · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./stack-editor/stack-editor').then((m) => m.StackEditor),
  },
  {
    path: ':siteId/stacks/:stackId',
    title: 'Stack · FlueLedger',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./stack-editor/stack-editor').then((m) => m.StackEditor),
  },
  {
    path: ':siteId/fuels/new',
    title: 'New fuel · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('../fuels/fuel-editor/fuel-editor').then((m) => m.FuelEditor),
  },
  {
    path: ':siteId/fuels/:fuelId',
    title: 'Fuel · FlueLedger',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('../fuels/fuel-editor/fuel-editor').then((m) => m.FuelEditor),
  },
  {
    path: ':siteId/permits/new',
    title: 'New permit · FlueLedger',
    canActivate: [permissionGuard('site:write')],
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('../permits/permit-editor/permit-editor').then((m) => m.PermitEditor),
  },
  {
    path: ':siteId/permits/:permitId',
    title: 'Permit · FlueLedger',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('../permits/permit-editor/permit-editor').then((m) => m.PermitEditor),
  },
];
