import { ChangeDetectionStrategy, Component, signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { testProviders } from '../testing/test-providers';
import { ScrollRegion } from './scroll-region';

@Component({
  selector: 'app-scroll-region-host',
  imports: [ScrollRegion],
  template: `
    <div class="box" style="width: 200px; overflow-x: auto" appScrollRegion="Wide table">
      <div class="content" [style.width.px]="contentWidth()">content</div>
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
class Host {
  readonly contentWidth = signal(600);
}

/**
 * WCAG 2.2 SC 2.1.1 Keyboard and SC 1.4.10 Reflow (axe-core's scrollable-region-focusable): a box
 * that scrolls sideways takes keyboard focus and has a name; one that does not adds no tab stop.
 */
describe('ScrollRegion', () => {
  async function render(
    width: number,
  ): Promise<{ fixture: ComponentFixture<Host>; box: HTMLElement }> {
    TestBed.configureTestingModule({ providers: testProviders() });
    const fixture = TestBed.createComponent(Host);
    fixture.componentInstance.contentWidth.set(width);
    // Attached to the document so the box has a layout to measure.
    document.body.appendChild(fixture.nativeElement);
    await settle(fixture);
    return { fixture, box: (fixture.nativeElement as HTMLElement).querySelector('.box')! };
  }

  /** Renders, then lets the ResizeObserver report and the host bindings follow. */
  async function settle(fixture: ComponentFixture<Host>): Promise<void> {
    await fixture.whenStable();
    await new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve)));
    await fixture.whenStable();
  }

  afterEach(() => {
    document.querySelectorAll('app-scroll-region-host').forEach((e) => e.remove());
  });

  it('makes an overflowing box a named region in the tab order', async () => {
    const { box } = await render(600);
    expect(box.scrollWidth).toBeGreaterThan(box.clientWidth);
    expect(box.getAttribute('role')).toBe('region');
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('aria-label')).toBe('Wide table');
    box.focus();
    expect(document.activeElement).toBe(box);
  });

  it('adds no tab stop, role or name while nothing overflows', async () => {
    const { box } = await render(150);
    expect(box.scrollWidth).toBeLessThanOrEqual(box.clientWidth);
    expect(box.hasAttribute('role')).toBeFalse();
    expect(box.hasAttribute('tabindex')).toBeFalse();
    expect(box.hasAttribute('aria-label')).toBeFalse();
  });

  it('follows its content when that grows wider or narrower', async () => {
    const { fixture, box } = await render(150);
    fixture.componentInstance.contentWidth.set(900);
    await settle(fixture);
    expect(box.getAttribute('tabindex')).toBe('0');
    expect(box.getAttribute('role')).toBe('region');
    fixture.componentInstance.contentWidth.set(100);
    await settle(fixture);
    expect(box.hasAttribute('tabindex')).toBeFalse();
  });
});
