// Karma configuration for `ng test` (builder @angular/build:karma).
//
// The package is `"type": "module"`, so this file is an ES module. Karma 6 loads its config with
// require(); Node 20.19+ can require() an ES module without top-level await and hands Karma the
// module namespace, whose `default` export Karma then uses as the config function.
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

// Debian's Chromium; karma-chrome-launcher reads CHROME_BIN.
process.env.CHROME_BIN ??= '/usr/bin/chromium';

/**
 * Prints one line a script can parse at the end of every run:
 * `Karma summary: 42 passed, 0 failed, 0 skipped, error: no`.
 * "error: yes" means the run itself broke (no browser, a script error outside a spec, a
 * disconnect), whatever the counts say.
 */
function SummaryReporter(baseReporterDecorator) {
  baseReporterDecorator(this);
  // Only the summary line: the dots reporter already prints failures, logs and browser errors.
  this.onBrowserLog = () => {};
  this.onBrowserError = () => {};
  this.onSpecComplete = () => {};
  this.onRunComplete = (_browsers, results) => {
    // A browser that never started, a disconnect, a script error outside a spec, or no spec at
    // all is an error of the run, whatever the counts say.
    const broken =
      results.error ||
      results.disconnected ||
      (results.exitCode !== 0 && results.failed === 0) ||
      results.success + results.failed === 0;
    this.write(
      `Karma summary: ${results.success} passed, ${results.failed} failed, ` +
        `${results.skipped} skipped, error: ${broken ? 'yes' : 'no'}\n`,
    );
  };
}
SummaryReporter.$inject = ['baseReporterDecorator'];

/** @param {import('karma').Config} config */
export default function karmaConfig(config) {
  config.set({
    basePath: '',
    // Chromium's --host-resolver-rules below leave only 127.0.0.1 resolvable, so not "localhost".
    hostname: '127.0.0.1',
    listenAddress: '127.0.0.1',
    frameworks: ['jasmine'],
    plugins: [
      require('karma-jasmine'),
      require('karma-chrome-launcher'),
      { 'reporter:summary': ['type', SummaryReporter] },
    ],
    client: {
      jasmine: {
        // Random order catches specs that depend on each other.
        random: true,
      },
    },
    // `dots` prints failures with their stack traces and `Executed N of M`; `summary` the line above.
    reporters: ['dots', 'summary'],
    colors: Boolean(process.stdout.isTTY),
    browsers: ['ChromiumHeadlessCI'],
    customLaunchers: {
      ChromiumHeadlessCI: {
        base: 'ChromeHeadless',
        // Debian's Chromium as root needs --no-sandbox; the rest keeps it quiet and offline.
        flags: [
          '--no-sandbox',
          '--disable-gpu',
          '--disable-dev-shm-usage',
          '--disable-background-networking',
          '--disable-component-update',
          '--disable-sync',
          '--disable-default-apps',
          '--disable-extensions',
          '--no-first-run',
          '--no-default-browser-check',
          '--disable-quic',
          '--mute-audio',
          // Any free debugging port, so that Karma runs in several work trees at once do not clash
          // (the launcher otherwise fixes 9222).
          '--remote-debugging-port=0',
          '--host-resolver-rules=MAP * ~NOTFOUND , EXCLUDE 127.0.0.1',
        ],
      },
    },
    // The builder sets singleRun from --watch; this default covers a direct `karma start`.
    singleRun: !process.argv.includes('--watch'),
    restartOnFileChange: true,
    browserNoActivityTimeout: 60000,
    captureTimeout: 120000,
  });
}
