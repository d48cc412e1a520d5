import type { Routes } from '@angular/router';

/** The Units area: the tables, a new unit, and a unit's page. */
export const UNITS_ROUTES: Routes = [
  {
    path: '',
    title: 'Units',
    loadComponent: () => import('./unit-list').then((m) => m.UnitList),
  },
  {
    path: 'new',
    title: 'New unit',
    loadComponent: () => import('./unit-new').then((m) => m.UnitNew),
  },
  {
    path: ':id',
    title: 'Unit',
    loadComponent: () => import('./unit-detail').then((m) => m.UnitDetail),
  },
];
