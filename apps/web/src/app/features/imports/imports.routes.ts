import { Routes } from '@angular/router';

/** The import screens, under /imports (the parent route checks `data:read`). */
export const importRoutes: Routes = [
  {
    path: '',
    title: 'Import data · FlueLedger',
    loadComponent: () => import('./import-page/import-page').then((m) => m.ImportPage),
  },
  {
    path: 'stacks/:stackId',
    title: 'Import data · FlueLedger',
    loadComponent: () => import('./import-page/import-page').then((m) => m.ImportPage),
  },
];
