import type { Routes } from '@angular/router';

/** The Kits area: the kit types, the school's tub bookings, then one kit type with its parts list, tubs and reports. */
export const KITS_ROUTES: Routes = [
  {
    path: '',
    title: 'Kits',
    loadComponent: () => import('./kit-list').then((m) => m.KitList),
  },
  {
    path: 'bookings',
    title: 'Bookings',
    loadComponent: () => import('./bookings').then((m) => m.Bookings),
  },
  {
    path: ':id',
    title: 'Kit type',
    loadComponent: () => import('./kit-detail').then((m) => m.KitDetail),
  },
];
