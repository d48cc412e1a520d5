import type { Routes } from '@angular/router';
import { SchoolSettingsPage } from './school-settings';
import { unsavedChangesGuard } from '../forms/unsaved-changes';

/** The School area: the settings, calendar and prep allowances (admins). */
export const SCHOOL_ROUTES: Routes = [
  {
    path: '',
    title: 'School settings',
    component: SchoolSettingsPage,
    canDeactivate: [unsavedChangesGuard],
  },
];
