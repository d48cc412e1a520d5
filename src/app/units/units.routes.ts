import type { Routes } from '@angular/router';
import { unsavedChangesGuard } from '../forms/unsaved-changes';

/** The Units area: the tables, a new unit, a unit's page and its editor. */
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
    path: ':id/edit',
    title: 'Edit unit',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./unit-editor').then((m) => m.UnitEditor),
  },
  {
    path: ':id',
    title: 'Unit',
    loadComponent: () => import('./unit-detail').then((m) => m.UnitDetail),
  },
];
