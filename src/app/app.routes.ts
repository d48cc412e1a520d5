import type { Routes } from '@angular/router';
import { roleGuard, signedInGuard, signedOutGuard } from './auth/guards';
import { AREA_ROLES } from './shell/navigation';
import { reliefLandsOnToday } from './relief/today-guard';

/**
 * Every route; feature areas load lazily and their guards mirror the server's role rules.
 * The shell comes first: an empty-path parent with children also matches `/` when none of its
 * children does, so the signed-out layout placed first would swallow the home page.
 */
export const routes: Routes = [
  // A group's tray, opened from its label without an account (the token is the credential).
  {
    path: 'tray',
    title: 'Your tray',
    loadComponent: () => import('./tray/tray-code').then((m) => m.TrayCode),
  },
  {
    path: 'tray/:token',
    title: 'Your tray',
    loadComponent: () => import('./tray/tray-page').then((m) => m.TrayPage),
  },
  {
    path: '',
    canActivate: [signedInGuard],
    loadComponent: () => import('./shell/shell').then((m) => m.Shell),
    children: [
      {
        path: '',
        pathMatch: 'full',
        title: 'Home',
        canActivate: [reliefLandsOnToday],
        loadComponent: () => import('./home/home').then((m) => m.Home),
      },
      {
        path: 'today',
        title: 'Today',
        canActivate: [roleGuard(AREA_ROLES.relief)],
        loadComponent: () => import('./relief/today').then((m) => m.Today),
      },
      {
        path: 'units',
        canActivate: [roleGuard(AREA_ROLES.units)],
        loadChildren: () => import('./units/units.routes').then((m) => m.UNITS_ROUTES),
      },
      {
        path: 'lessons',
        canActivate: [roleGuard([...AREA_ROLES.units, ...AREA_ROLES.relief])],
        loadChildren: () => import('./lessons/lessons.routes').then((m) => m.LESSONS_ROUTES),
      },
      {
        path: 'outcomes',
        canActivate: [roleGuard(AREA_ROLES.outcomes)],
        loadChildren: () => import('./outcomes/outcomes.routes').then((m) => m.OUTCOMES_ROUTES),
      },
      {
        path: 'kits',
        canActivate: [roleGuard(AREA_ROLES.kits)],
        loadChildren: () => import('./kits/kits.routes').then((m) => m.KITS_ROUTES),
      },
      {
        path: 'classes',
        canActivate: [roleGuard(AREA_ROLES.classes)],
        loadChildren: () => import('./classes/classes.routes').then((m) => m.CLASSES_ROUTES),
      },
      {
        path: 'review',
        canActivate: [roleGuard(AREA_ROLES.review)],
        loadChildren: () => import('./review/review.routes').then((m) => m.REVIEW_ROUTES),
      },
      {
        path: 'coverage',
        title: 'Outcome coverage',
        canActivate: [roleGuard(AREA_ROLES.coverage)],
        loadComponent: () => import('./review/coverage').then((m) => m.CoveragePage),
      },
      {
        path: 'relief',
        canActivate: [roleGuard(AREA_ROLES.relief)],
        loadChildren: () => import('./relief/relief.routes').then((m) => m.RELIEF_ROUTES),
      },
      {
        path: 'school',
        canActivate: [roleGuard(AREA_ROLES.school)],
        loadChildren: () => import('./school/school.routes').then((m) => m.SCHOOL_ROUTES),
      },
      {
        path: 'members',
        title: 'Members',
        canActivate: [roleGuard(AREA_ROLES.members)],
        loadComponent: () => import('./members/members').then((m) => m.Members),
      },
      {
        path: 'dev/mail',
        title: 'Mail outbox (development)',
        canActivate: [roleGuard(AREA_ROLES.devMail)],
        loadComponent: () => import('./dev-mail/dev-mail').then((m) => m.DevMail),
      },
      {
        path: 'account',
        title: 'Account',
        loadComponent: () => import('./account/account').then((m) => m.Account),
      },
    ],
  },
  {
    path: '',
    loadComponent: () => import('./auth/auth-layout').then((m) => m.AuthLayout),
    children: [
      {
        path: 'sign-in',
        title: 'Sign in',
        canActivate: [signedOutGuard],
        loadComponent: () => import('./auth/sign-in').then((m) => m.SignIn),
      },
      {
        path: 'reset',
        title: 'Reset your password',
        loadComponent: () => import('./auth/reset-request').then((m) => m.ResetRequest),
      },
      {
        path: 'reset/:token',
        title: 'Choose a new password',
        loadComponent: () => import('./auth/reset-complete').then((m) => m.ResetComplete),
      },
      {
        path: 'invitation/:token',
        title: 'Join your school',
        loadComponent: () => import('./auth/invitation').then((m) => m.Invitation),
      },
    ],
  },
  {
    // A share link, opened without an account (no guard: the token is the key).
    path: 'pack/:token',
    title: 'Shared lesson',
    loadComponent: () => import('./share/shared-pack').then((m) => m.SharedPack),
  },
  { path: '**', redirectTo: '' },
];
