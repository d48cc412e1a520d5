import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { hashPassword, passwordProblem, verifyPassword } from '../../server/auth/passwords.js';
import { newPasswordSchema } from '../../shared/schemas/auth.js';
import { backoffSeconds } from '../../server/mail/outbox.js';

describe('password storage (OWASP Password Storage Cheat Sheet)', () => {
  it('stores argon2id with at least m = 19456 KiB, t = 2, p = 1, read back from the PHC string', async () => {
    const phc = await hashPassword('a long enough phrase');
    // PHC string format: $argon2id$v=19$m=<KiB>,t=<iterations>,p=<lanes>$<salt>$<hash>
    const m =
      /^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$([A-Za-z0-9+/]+)\$([A-Za-z0-9+/]+)$/.exec(phc);
    assert.ok(m, `PHC string ${phc}`);
    // OWASP Password Storage Cheat Sheet, "Argon2id": minimum m=19456 (19 MiB), t=2, p=1.
    assert.ok(Number(m[1]) >= 19456);
    assert.ok(Number(m[2]) >= 2);
    assert.ok(Number(m[3]) >= 1);
    assert.ok(Buffer.from(m[4]!, 'base64').length >= 16, 'a salt of at least 128 bits');
    assert.equal(await verifyPassword(phc, 'a long enough phrase'), true);
    assert.equal(await verifyPassword(phc, 'a long enough phrasE'), false);
  });

  it('gives a different salt each time', async () => {
    assert.notEqual(await hashPassword('same words here'), await hashPassword('same words here'));
  });
});

describe('password policy (NIST SP 800-63B §5.1.1.2)', () => {
  it('asks for at least 8 characters', () => {
    assert.equal(newPasswordSchema.safeParse('seven77').success, false);
    assert.equal(newPasswordSchema.safeParse('eight888').success, true);
  });
  it('allows 64 characters and more', () => {
    assert.equal(
      newPasswordSchema.safeParse('x'.repeat(30) + ' '.repeat(4) + 'y'.repeat(40)).success,
      true,
    );
  });
  it('has no composition rules: lower-case words with spaces are fine', () => {
    assert.equal(passwordProblem('tubs of gears on tuesday'), null);
  });
  it('refuses passwords from the bundled list of common passwords', () => {
    // "password" and "12345678" top every published list of leaked passwords (from memory).
    assert.notEqual(passwordProblem('password'), null);
    assert.notEqual(passwordProblem('12345678'), null);
    assert.notEqual(passwordProblem('PassWord'), null);
  });
  it('refuses context-specific words: the e-mail address and the service name', () => {
    assert.notEqual(passwordProblem('sam@kestrel.example', 'sam@kestrel.example'), null);
    assert.notEqual(passwordProblem('trayplan1'), null);
  });
});

describe('outbox backoff', () => {
  it('doubles from 5 s and stops growing at 15 minutes', () => {
    assert.deepEqual([1, 2, 3, 4].map(backoffSeconds), [5, 10, 20, 40]);
    assert.equal(backoffSeconds(30), 900);
  });
});
