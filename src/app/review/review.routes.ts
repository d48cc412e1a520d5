import type { Routes } from '@angular/router';

/** The Review area: the queue of units waiting for a decision, and a unit's review page. */
export const REVIEW_ROUTES: Routes = [
  {
    path: '',
    title: 'Review',
    loadComponent: () => import('./review-queue').then((m) => m.ReviewQueue),
  },
  {
    path: 'units/:id',
    title: 'Review a unit',
    loadComponent: () => import('./review-unit').then((m) => m.ReviewUnitPage),
  },
];
