import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import type { TrayView } from '../../../shared/schemas/trays';
import { testProviders } from '../testing/test-providers';
import { TrayPage } from './tray-page';

const TOKEN = 'AbCdEfGhIjKlMnOpQrStUvWx';
const URL = `/api/trays/${TOKEN}`;

function view(): TrayView {
  const line = {
    colour: 'teal',
    compartment: 'B2',
    small: true,
    rechargeable: false,
    out: false,
    back: false,
    missing: 0,
  };
  return {
    lesson: {
      title: 'Sense the wall',
      startsAt: '2026-08-04T11:10',
      endsAt: '2026-08-04T12:00',
      className: '4K',
    },
    group: {
      number: 2,
      size: 3,
      homeTub: 'Tub 2',
      controllerLabel: 'Rover 2',
      lines: [
        {
          ...line,
          partCode: 'PEG-S',
          name: 'Short peg',
          qty: 6,
          needed: 6,
          sources: [{ tub: 'Tub 2', qty: 6 }],
        },
        {
          ...line,
          partCode: 'ROD-90',
          name: 'Drive rod 90',
          qty: 2,
          needed: 2,
          sources: [
            { tub: 'Tub 2', qty: 1 },
            { tub: 'Tub 5', qty: 1 },
          ],
        },
      ],
    },
    expiresAt: '2026-08-04T14:30:00.000Z',
  };
}

async function setUp() {
  localStorage.removeItem(`trayplan.tray.${TOKEN}`);
  TestBed.configureTestingModule({ providers: testProviders() });
  const fixture = TestBed.createComponent(TrayPage);
  fixture.componentRef.setInput('token', TOKEN);
  const http = TestBed.inject(HttpTestingController);
  // The tray is a resource read: it goes out with the first check and holds stability until answered.
  fixture.detectChanges();
  http.expectOne(URL).flush(view());
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  return { fixture, http, loader, el: fixture.nativeElement as HTMLElement };
}

describe('TrayPage', () => {
  afterEach(() => localStorage.removeItem(`trayplan.tray.${TOKEN}`));

  it('shows each line with its compartment, quantity, borrows, the controller and the cautions', async () => {
    const { el } = await setUp();
    const text = el.textContent ?? '';
    expect(text).toContain('Group 2');
    expect(text).toContain('Rover 2');
    expect(text).toContain('Compartment B2');
    expect(text).toContain('× 6');
    expect(text).toContain('Borrowed: 1 from Tub 5. They go back to Tub 5.');
    expect(text).toContain('Small parts');
    expect(text).toContain('policies and local regulations come first');
  });

  it('saves a tick with one request per tap', async () => {
    const { http, loader, fixture } = await setUp();
    const out = await loader.getHarness(
      MatButtonHarness.with({ selector: '[aria-label="Out: Short peg"]' }),
    );
    await out.click();
    const req = http.expectOne(`${URL}/lines/PEG-S`);
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ out: true });
    req.flush({ ...view().group.lines[0], out: true });
    await fixture.whenStable();
    expect(localStorage.getItem(`trayplan.tray.${TOKEN}`)).toBeNull();
    http.verify();
  });

  it('keeps taps made without a network, shows them, and sends them when the network returns', async () => {
    const { http, loader, fixture, el } = await setUp();
    const more = await loader.getHarness(
      MatButtonHarness.with({ selector: '[aria-label="One more missing: Drive rod 90"]' }),
    );
    await more.click();
    http.expectOne(`${URL}/lines/ROD-90`).error(new ProgressEvent('error'), { status: 0 });
    await fixture.whenStable();
    expect(el.textContent).toContain('1 tap waits');
    expect(el.textContent).toContain('1 missing');
    expect(JSON.parse(localStorage.getItem(`trayplan.tray.${TOKEN}`)!)).toEqual([
      { partCode: 'ROD-90', change: { missing: 1 } },
    ]);
    window.dispatchEvent(new Event('online'));
    const again = http.expectOne(`${URL}/lines/ROD-90`);
    expect(again.request.body).toEqual({ missing: 1 });
    again.flush({ ...view().group.lines[1], missing: 1 });
    await fixture.whenStable();
    expect(el.textContent).toContain('Every tap is saved.');
  });
});
