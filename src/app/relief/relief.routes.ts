import type { Routes } from '@angular/router';

/** The Relief area: the lessons assigned to the signed-in relief teacher. */
export const RELIEF_ROUTES: Routes = [
  {
    path: '',
    title: 'Relief',
    loadComponent: () => import('./relief').then((m) => m.Relief),
  },
];
