import { TestBed } from '@angular/core/testing';
import { RouterTestingHarness } from '@angular/router/testing';
import { testProviders } from '../testing/test-providers';
import { PagePlaceholder } from './page-placeholder';

describe('PagePlaceholder', () => {
  it('shows the heading and the purpose from the route data', async () => {
    TestBed.configureTestingModule({
      providers: testProviders([
        {
          path: 'school',
          component: PagePlaceholder,
          data: { heading: 'School', purpose: 'School settings: timezone and bell times.' },
        },
      ]),
    });
    const harness = await RouterTestingHarness.create();
    const page = await harness.navigateByUrl('/school', PagePlaceholder);
    expect(page).toEqual(jasmine.any(PagePlaceholder));
    const root = harness.routeNativeElement as HTMLElement;
    expect(root.querySelector('h1')?.textContent).toBe('School');
    expect(root.querySelector('p')?.textContent).toBe('School settings: timezone and bell times.');
  });
});
