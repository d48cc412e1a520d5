import type { Routes } from '@angular/router';

/** A lesson and its prep plan (`/lessons/:id`, optional `?group=N`). */
export const LESSONS_ROUTES: Routes = [
  {
    path: ':id',
    title: 'Lesson',
    loadComponent: () => import('./lesson-view').then((m) => m.LessonView),
  },
];
