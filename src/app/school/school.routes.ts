import type { Routes } from '@angular/router';
import { PagePlaceholder } from '../shell/page-placeholder';

/** The School area; its screens replace the placeholder. */
export const SCHOOL_ROUTES: Routes = [
  {
    path: '',
    title: 'School',
    component: PagePlaceholder,
    data: {
      heading: 'School',
      purpose: 'School settings: timezone, terms, bell times, paper size and prep allowances.',
    },
  },
];
