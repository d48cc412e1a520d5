/**
 * Issue 13, offline: the client shell is static, so the copy the service worker keeps runs under
 * the same policy offline. `/`, `/index.html` and every client route send the built index.html
 * byte for byte (the worker checks it against its hash in ngsw.json); the CSP carries no
 * per-request nonce; the worker's own files are revalidated on every visit (a new version is
 * found, then used from the next visit); and API answers echo a read's tag so a cached answer
 * can be told from a live one.
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import supertest from 'supertest';
import type { Express } from 'express';
import { testApp, type TestApp } from '../support/app.js';
import { createApp } from '../../server/app.js';

let t: TestApp;
let dir: string;
let app: Express;
// Built the way `ng build` writes it: no inline script, no nonce placeholder.
const BUILT =
  '<!doctype html><html lang="en-AU"><head><link rel="stylesheet" href="styles-ABC.css">' +
  '</head><body><app-root></app-root><script src="main-XYZ.js" type="module"></script>' +
  '</body></html>\n';

before(async () => {
  t = await testApp();
  dir = mkdtempSync(path.join(tmpdir(), 'trayplan-shell-'));
  writeFileSync(path.join(dir, 'index.html'), BUILT);
  writeFileSync(path.join(dir, 'ngsw.json'), '{"configVersion":1}');
  writeFileSync(path.join(dir, 'ngsw-worker.js'), '/* worker */');
  writeFileSync(path.join(dir, 'main-XYZ.js'), 'console.log(1);');
  app = createApp(t.ctx, { pruneSessions: false, clientDir: dir });
});
after(async () => {
  rmSync(dir, { recursive: true, force: true });
  await t.close();
});

/** A header's directives (CSP Level 3 §2.2.1: a policy is a list of ';'-separated directives). */
function directives(csp: string): Map<string, string[]> {
  const map = new Map<string, string[]>();
  for (const part of csp.split(';')) {
    const [name, ...values] = part.trim().split(/\s+/);
    if (name) map.set(name.toLowerCase(), values);
  }
  return map;
}

describe('the client shell (issue 13, offline)', () => {
  it('sends /, /index.html and a client route byte for byte as built', async () => {
    const answers = await Promise.all(
      ['/', '/index.html', '/lessons/some-lesson', '/today'].map((url) =>
        supertest(app).get(url).buffer(true),
      ),
    );
    for (const res of answers) {
      assert.equal(res.status, 200);
      assert.match(String(res.headers['content-type']), /^text\/html/);
      assert.ok(Buffer.from(res.text).equals(Buffer.from(BUILT)), 'the built bytes, unchanged');
      // RFC 9111 §5.2.2.4: no-cache lets a copy be kept but revalidated before each use.
      assert.equal(res.headers['cache-control'], 'no-cache');
    }
  });

  it('has a CSP without a nonce, with scripts and workers from this origin only', async () => {
    const [first, second] = await Promise.all([
      supertest(app).get('/'),
      supertest(app).get('/index.html'),
    ]);
    const csp = String(first.headers['content-security-policy']);
    // The same policy every time: nothing in it is made per request.
    assert.equal(String(second.headers['content-security-policy']), csp);
    assert.doesNotMatch(csp, /nonce-/);
    const d = directives(csp);
    // CSP Level 3 §6.1.11 and §6.1.14: script-src and worker-src, 'self' only.
    assert.deepEqual(d.get('script-src'), ["'self'"]);
    assert.deepEqual(d.get('worker-src'), ["'self'"]);
    assert.deepEqual(d.get('default-src'), ["'self'"]);
    assert.deepEqual(d.get('object-src'), ["'none'"]);
  });

  it("revalidates the worker's files on every visit; the app's hashed files may be kept", async () => {
    for (const file of ['/ngsw.json', '/ngsw-worker.js']) {
      const res = await supertest(app).get(file);
      assert.equal(res.status, 200, file);
      assert.equal(res.headers['cache-control'], 'no-cache', file);
    }
    const script = await supertest(app).get('/main-XYZ.js');
    assert.equal(script.status, 200);
    assert.equal(script.headers['cache-control'], 'public, max-age=3600');
  });
});

describe("a read's tag (issue 13, saved copies)", () => {
  it('is echoed on API answers when it is a hex tag, and ignored otherwise', async () => {
    const tag = 'a1b2c3d4e5f60718293a4b5c6d7e8f90';
    const echoed = await supertest(app).get('/api/auth/session').set('X-Trayplan-Read', tag);
    assert.equal(echoed.status, 200);
    assert.equal(echoed.headers['x-trayplan-read'], tag);
    // RFC 9110 §6.6.1: the answer is dated, which says how old a saved copy of it is.
    assert.ok(!Number.isNaN(Date.parse(String(echoed.headers['date']))));
    for (const bad of ['not hex!', 'abc', `${tag}<x>`, 'f'.repeat(65)]) {
      const res = await supertest(app).get('/api/auth/session').set('X-Trayplan-Read', bad);
      assert.equal(res.headers['x-trayplan-read'], undefined, JSON.stringify(bad));
    }
    const none = await supertest(app).get('/api/auth/session');
    assert.equal(none.headers['x-trayplan-read'], undefined);
  });
});
