import type { Routes } from '@angular/router';
import { PagePlaceholder } from '../shell/page-placeholder';

/** Outcomes frameworks: browse, search and import; its screens replace the placeholder. */
export const OUTCOMES_ROUTES: Routes = [
  {
    path: '',
    title: 'Outcomes',
    component: PagePlaceholder,
    data: { heading: 'Outcomes', purpose: 'The learning outcomes frameworks units are planned against.' },
  },
];
