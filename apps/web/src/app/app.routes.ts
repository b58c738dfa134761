import { Routes } from '@angular/router';

import { authGuard, permissionGuard, signedOutGuard } from './core/auth/guards';

export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · FlueLedger',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./features/sign-in/sign-in').then((m) => m.SignIn),
  },
  {
    path: '',
    canActivate: [authGuard],
    loadComponent: () => import('./core/layout/shell').then((m) => m.Shell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'overview' },
      {
        path: 'overview',
        title: 'Overview · FlueLedger',
        loadComponent: () => import('./features/overview/overview').then((m) => m.Overview),
      },
      {
        path: 'sites',
        canActivate: [permissionGuard('site:read')],
        loadChildren: () => import('./features/sites/sites.routes').then((m) => m.siteRoutes),
      },
      {
        path: 'imports',
        canActivate: [permissionGuard('data:import')],
        loadChildren: () => import('./features/imports/imports.routes').then((m) => m.importRoutes),
      },
      {
        path: 'review',
        canActivate: [permissionGuard('data:read')],
        loadChildren: () => import('./features/review/review.routes').then((m) => m.reviewRoutes),
      },
      {
        path: 'members',
        title: 'Members · FlueLedger',
        canActivate: [permissionGuard('members:read')],
        loadComponent: () => import('./features/members/members').then((m) => m.Members),
      },
      {
        path: 'audit-log',
        title: 'Audit log · FlueLedger',
        canActivate: [permissionGuard('audit:read')],
        loadComponent: () => import('./features/audit-log/audit-log').then((m) => m.AuditLog),
      },
    ],
  },
  {
    path: '**',
    title: 'Page not found · FlueLedger',
    loadComponent: () => import('./features/not-found/not-found').then((m) => m.NotFound),
  },
];
