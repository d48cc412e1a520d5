import { ROLES, type Role } from '../../../shared/schemas/common';
import { AREA_ROLES, NAV_ITEMS, mayOpen, navItemsFor } from './navigation';

function labels(role: Role, devMailAvailable = false): string[] {
  return navItemsFor(role, { devMailAvailable }).map((item) => item.label);
}

describe('navigation by role', () => {
  it('gives a teacher Home, Units, Kits, Classes and Coverage', () => {
    expect(labels('teacher')).toEqual(['Home', 'Units', 'Kits', 'Classes', 'Coverage']);
  });

  it('gives a curriculum lead Home, Units, Review, Outcomes and Coverage', () => {
    expect(labels('lead')).toEqual(['Home', 'Units', 'Review', 'Outcomes', 'Coverage']);
  });

  it('gives a relief teacher Home and Relief', () => {
    expect(labels('relief')).toEqual(['Home', 'Relief']);
  });

  it('gives an admin Home, Review, Kits, Classes, Outcomes, Coverage, School and Members', () => {
    expect(labels('admin')).toEqual([
      'Home',
      'Review',
      'Kits',
      'Classes',
      'Outcomes',
      'Coverage',
      'School',
      'Members',
    ]);
  });

  it('adds the mail outbox for an admin only while it is available', () => {
    expect(labels('admin', true)).toEqual([
      'Home',
      'Review',
      'Kits',
      'Classes',
      'Outcomes',
      'Coverage',
      'School',
      'Members',
      'Mail outbox (development)',
    ]);
    for (const role of ['teacher', 'lead', 'relief'] as const) {
      expect(labels(role, true)).not.toContain('Mail outbox (development)');
    }
  });

  it('keeps Account out of the navigation (it is in the user menu)', () => {
    for (const role of ROLES) {
      expect(labels(role, true)).not.toContain('Account');
    }
  });

  it('uses absolute, distinct paths', () => {
    const paths = NAV_ITEMS.map((item) => item.path);
    expect(paths.every((path) => path.startsWith('/'))).toBeTrue();
    expect(new Set(paths).size).toBe(paths.length);
  });

  it('answers mayOpen the same way the navigation shows it', () => {
    for (const role of ROLES) {
      const shown = new Set(navItemsFor(role, { devMailAvailable: true }).map((i) => i.area));
      for (const area of Object.keys(AREA_ROLES) as (keyof typeof AREA_ROLES)[]) {
        expect(mayOpen(role, area)).withContext(`${role} → ${area}`).toBe(shown.has(area));
      }
    }
  });
});
