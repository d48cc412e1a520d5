import type { Routes } from '@angular/router';

/** The Classes area: the school's classes. */
export const CLASSES_ROUTES: Routes = [
  {
    path: '',
    title: 'Classes',
    loadComponent: () => import('./classes').then((m) => m.Classes),
  },
];
