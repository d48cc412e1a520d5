/**
 * Trayplan's own light palette. These hex values are the single source of truth: the SCSS theme
 * (`src/styles.scss`) uses exactly these values, and `tests/shared/contrast.test.ts` checks every
 * text/background pair against WCAG 2.2 SC 1.4.3 (4.5:1) and every control pair against
 * SC 1.4.11 (3:1), and that the SCSS file really carries them.
 *
 * The hues: a deep eucalyptus green for actions and the toolbar, a warm clay for accents and the
 * keyboard focus ring, a slate blue for links, on a warm paper-white surface.
 */

/** Filled buttons, the toolbar, selected controls. */
export const PRIMARY = '#2E5E4E';
/** Text and icons on `PRIMARY`. */
export const ON_PRIMARY = '#FFFFFF';
/** Quiet highlight behind primary content (chips, selected rows). */
export const PRIMARY_CONTAINER = '#D3E8DD';
/** Text on `PRIMARY_CONTAINER`. */
export const ON_PRIMARY_CONTAINER = '#10291F';

/** Accent colour: the focus ring and accent text. */
export const SECONDARY = '#8C4A12';
/** Text on `SECONDARY`. */
export const ON_SECONDARY = '#FFFFFF';
/** Background of the selected navigation item. */
export const SECONDARY_CONTAINER = '#F7E3D0';
/** Text on `SECONDARY_CONTAINER`. */
export const ON_SECONDARY_CONTAINER = '#3A1D05';

/** Page background. */
export const SURFACE = '#FBFAF6';
/** Cards, side navigation and table headers. */
export const SURFACE_CONTAINER = '#EFEEE8';
/** Body text. */
export const ON_SURFACE = '#1C1F1D';
/** Secondary text: hints, captions, table metadata. */
export const ON_SURFACE_VARIANT = '#4A514D';

/** Borders of controls (text fields, outlined buttons, checkboxes): must reach 3:1. */
export const OUTLINE = '#727A75';
/** Decorative dividers only; never the only boundary of a control, so not held to 3:1. */
export const OUTLINE_VARIANT = '#C3C8C3';

/** Error text and the border of a field in error. */
export const ERROR = '#A8321F';
/** Text on `ERROR`. */
export const ON_ERROR = '#FFFFFF';
/** Background of an error banner. */
export const ERROR_CONTAINER = '#FBE0DA';
/** Text on `ERROR_CONTAINER`. */
export const ON_ERROR_CONTAINER = '#4A0F05';

/** Snack-bars and tooltips. */
export const INVERSE_SURFACE = '#2F312E';
/** Text on `INVERSE_SURFACE`. */
export const INVERSE_ON_SURFACE = '#F2F1EC';
/** Action buttons on `INVERSE_SURFACE` (the snack-bar's "Dismiss"). */
export const INVERSE_PRIMARY = '#A3D2BF';

/** Links in running text. */
export const LINK = '#225B8C';
/** The keyboard focus ring on light surfaces. */
export const FOCUS_RING = SECONDARY;

/**
 * Every colour above keyed by the name it has in the SCSS theme: Material's system colour names
 * (emitted as `--mat-sys-<name>`) and Trayplan's own (`--trayplan-<name>`).
 */
export const THEME_COLOURS = {
  primary: PRIMARY,
  'on-primary': ON_PRIMARY,
  'primary-container': PRIMARY_CONTAINER,
  'on-primary-container': ON_PRIMARY_CONTAINER,
  secondary: SECONDARY,
  'on-secondary': ON_SECONDARY,
  'secondary-container': SECONDARY_CONTAINER,
  'on-secondary-container': ON_SECONDARY_CONTAINER,
  surface: SURFACE,
  background: SURFACE,
  'surface-container': SURFACE_CONTAINER,
  'on-surface': ON_SURFACE,
  'on-background': ON_SURFACE,
  'on-surface-variant': ON_SURFACE_VARIANT,
  outline: OUTLINE,
  'outline-variant': OUTLINE_VARIANT,
  error: ERROR,
  'on-error': ON_ERROR,
  'error-container': ERROR_CONTAINER,
  'on-error-container': ON_ERROR_CONTAINER,
  'inverse-surface': INVERSE_SURFACE,
  'inverse-on-surface': INVERSE_ON_SURFACE,
  'inverse-primary': INVERSE_PRIMARY,
} as const;

/** Trayplan's own custom properties, emitted as `--trayplan-<name>` in the SCSS theme. */
export const TRAYPLAN_COLOURS = {
  link: LINK,
  'focus-ring': FOCUS_RING,
} as const;
