import type { Routes } from '@angular/router';
import { PagePlaceholder } from '../shell/page-placeholder';

/** The Review area; its screens replace the placeholder. */
export const REVIEW_ROUTES: Routes = [
  {
    path: '',
    title: 'Review',
    component: PagePlaceholder,
    data: {
      heading: 'Review',
      purpose:
        'Units sent for review, with comments and decisions, and outcome coverage by year level.',
    },
  },
];
