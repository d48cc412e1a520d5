/**
 * Every CSV export guards text a spreadsheet would run as a formula, as OWASP's "CSV Injection"
 * page says: a cell starting with =, +, -, @, tab or carriage return gets a leading apostrophe.
 * Read back with csv-parse (RFC 4180).
 */
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { parse } from 'csv-parse/sync';
import { signedIn, testApp, type TestApp } from '../support/app.js';
import { writeCsv } from '../../server/csv/writer.js';

let t: TestApp;
before(async () => {
  t = await testApp();
});
after(async () => {
  await t.close();
});

describe('the CSV writer', () => {
  it('puts an apostrophe before every formula start (OWASP CSV Injection), never before numbers', () => {
    const text = writeCsv(
      ['a', 'b'],
      [
        ['=1+2', '+SUM(A1)'],
        ['-2+3', '@cmd'],
        ['\tTAB', '\rCR'],
        ['plain', -3],
      ],
    );
    const rows = parse(text) as string[][];
    assert.deepEqual(rows.slice(1), [
      ["'=1+2", "'+SUM(A1)"],
      ["'-2+3", "'@cmd"],
      ["'\tTAB", "'\rCR"],
      ['plain', '-3'],
    ]);
  });
});

describe('GET /api/kit-types/:id/replacements.csv', () => {
  it('guards part codes, names and tub labels', async () => {
    const admin = await signedIn(t.app, 'admin@kestrel-ridge.example');
    const kit = await admin.post('/api/kit-types', { name: 'Injection Kit' });
    assert.equal(kit.status, 201, kit.text);
    const kitId = kit.body.kitType?.id ?? kit.body.id;
    const version = kit.body.kitType?.version ?? kit.body.version;
    const parts = await admin.agent
      .put(`/api/kit-types/${kitId}/parts`)
      .set('X-XSRF-TOKEN', admin.csrf)
      .send({
        version,
        parts: [
          {
            code: '+P1',
            name: '=HYPERLINK("http://example.invalid","Open")',
            colour: null,
            category: 'other',
            qty: 4,
            compartment: null,
            small: false,
            chargeMinutes: null,
          },
        ],
      });
    assert.equal(parts.status, 200, parts.text);
    const tub = await admin.post('/api/tubs', { kitTypeId: kitId, label: '@Tub 1' });
    assert.equal(tub.status, 201, tub.text);
    const tubId = tub.body.tub?.id ?? tub.body.id;
    const audit = await admin.post(`/api/tubs/${tubId}/audits`, {
      missing: [{ partCode: '+P1', count: 2 }],
    });
    assert.equal(audit.status, 201, audit.text);

    const res = await admin.get(`/api/kit-types/${kitId}/replacements.csv`);
    assert.equal(res.status, 200);
    const rows = parse(res.text, { bom: true }) as string[][];
    assert.deepEqual(rows[0], ['code', 'name', 'missing', 'tubs']);
    assert.deepEqual(rows[1], [
      "'+P1",
      `'=HYPERLINK("http://example.invalid","Open")`,
      '2',
      "'@Tub 1 (2)",
    ]);
  });
});
