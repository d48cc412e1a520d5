import type { Routes } from '@angular/router';
import { unsavedChangesGuard } from '../forms/unsaved-changes';

/**
 * A lesson and its prep plan (`/lessons/:id`, optional `?group=N`); a new lesson
 * (`/lessons/new?unit=<unitId>`) and a lesson's editor (`/lessons/:id/edit`), listed first so
 * `new` is not read as an id.
 */
export const LESSONS_ROUTES: Routes = [
  {
    path: 'new',
    title: 'New lesson',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./lesson-editor').then((m) => m.LessonEditor),
  },
  {
    path: ':id/edit',
    title: 'Edit lesson',
    canDeactivate: [unsavedChangesGuard],
    loadComponent: () => import('./lesson-editor').then((m) => m.LessonEditor),
  },
  {
    path: ':id',
    title: 'Lesson',
    loadComponent: () => import('./lesson-view').then((m) => m.LessonView),
  },
];
