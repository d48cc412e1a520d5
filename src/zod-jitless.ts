/**
 * Loaded before the app (angular.json `polyfills`), so it runs before any zod schema is built.
 *
 * Zod probes `new Function` when it builds an object schema; under Trayplan's strict
 * Content-Security-Policy (no 'unsafe-eval') that probe is reported as a violation even though
 * zod catches the error. `jitless` turns the probe off. Zod keeps its configuration on
 * `globalThis.__zod_globalConfig` (zod/v4/core/core.js) so that every copy shares it; it is set
 * here rather than with `config()` from zod because esbuild's code splitting evaluates the shared
 * schema modules before anything in main.ts runs.
 */
const holder = globalThis as { __zod_globalConfig?: Record<string, unknown> };
holder.__zod_globalConfig = { ...holder.__zod_globalConfig, jitless: true };

export {};
