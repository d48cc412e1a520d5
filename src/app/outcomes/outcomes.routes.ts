import type { Routes } from '@angular/router';
import { OutcomesPage } from './outcomes';

/** Outcomes frameworks: browse and search; admins and leads create and import. */
export const OUTCOMES_ROUTES: Routes = [{ path: '', title: 'Outcomes', component: OutcomesPage }];
