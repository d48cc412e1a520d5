import type { Routes } from '@angular/router';
import { PagePlaceholder } from '../shell/page-placeholder';

/** The Relief area; its screens replace the placeholder. */
export const RELIEF_ROUTES: Routes = [
  {
    path: '',
    title: 'Relief',
    component: PagePlaceholder,
    data: {
      heading: 'Relief',
      purpose: 'The lessons assigned to you as a relief teacher, each with its lesson pack.',
    },
  },
];
