import { Routes } from '@angular/router';
import { provideCharts, withDefaultRegisterables } from 'ng2-charts';

/**
 * The data review screens, under /review (the parent route checks `data:read`). Chart.js is
 * registered here, so its code loads with these pages only.
 */
export const reviewRoutes: Routes = [
  {
    path: '',
    providers: [provideCharts(withDefaultRegisterables())],
    children: [
      {
        path: '',
        title: 'Data review · FlueLedger',
        loadComponent: () => import('./review-page/review-page').then((m) => m.ReviewPage),
      },
      {
        path: 'stacks/:stackId',
        title: 'Data review · FlueLedger',
        loadComponent: () => import('./review-page/review-page').then((m) => m.ReviewPage),
      },
    ],
  },
];
