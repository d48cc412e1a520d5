import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { Part } from '../../../shared/schemas/kits';
import { testProviders } from '../testing/test-providers';
import type { NewPart } from './kits-api';
import { PartsTable, type PartSave } from './parts-table';

/** Invented parts of the invented demo kit type. */
function part(over: Partial<Part> & Pick<Part, 'id' | 'code' | 'name'>): Part {
  return {
    colour: null,
    category: 'other',
    qty: 1,
    compartment: null,
    small: false,
    chargeMinutes: null,
    hasPhoto: false,
    ...over,
  };
}

const PARTS: Part[] = [
  part({
    id: 'p1',
    code: 'RB-CTL',
    name: 'Rover controller',
    category: 'controller',
    qty: 1,
    chargeMinutes: 180,
    compartment: 'A',
  }),
  part({
    id: 'p2',
    code: 'RB-MOT',
    name: 'Drive motor',
    category: 'motor',
    qty: 2,
    compartment: 'B',
  }),
  part({
    id: 'p3',
    code: 'RB-PEG',
    name: 'Connector peg',
    colour: 'Grey',
    category: 'connector',
    qty: 40,
    small: true,
    compartment: 'C',
  }),
  part({
    id: 'p4',
    code: 'RB-WHL',
    name: 'Wheel',
    colour: 'Black',
    category: 'wheel',
    qty: 4,
    compartment: 'D',
  }),
];

describe('PartsTable', () => {
  let fixture: ComponentFixture<PartsTable>;
  let loader: HarnessLoader;

  async function setUp(parts: readonly Part[], canEdit: boolean): Promise<void> {
    TestBed.configureTestingModule({ providers: testProviders() });
    fixture = TestBed.createComponent(PartsTable);
    fixture.componentRef.setInput('parts', parts);
    fixture.componentRef.setInput('canEdit', canEdit);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    await fixture.whenStable();
  }

  async function column(name: string): Promise<string[]> {
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getCellTextByColumnName();
    return rows[name]?.text ?? [];
  }

  it('renders one row per part with every column', async () => {
    await setUp(PARTS, false);
    expect(await column('code')).toEqual(['RB-CTL', 'RB-MOT', 'RB-PEG', 'RB-WHL']);
    const table = await loader.getHarness(MatTableHarness);
    const [first] = await table.getRows();
    const cells = await first!.getCellTextByColumnName();
    expect(cells).toEqual({
      // No photo stored, and no upload button for someone who may not edit.
      photo: '',
      code: 'RB-CTL',
      name: 'Rover controller',
      colour: '—',
      category: 'controller',
      qty: '1',
      compartment: 'A',
      small: 'No',
      chargeMinutes: '180',
    });
    // No edit column for someone who may not edit.
    expect(
      await loader.getAllHarnesses(MatButtonHarness.with({ selector: '[aria-label^="Edit"]' })),
    ).toEqual([]);
  });

  it('filters by code, name, colour, category or compartment', async () => {
    await setUp(PARTS, false);
    const filter = await loader.getHarness(MatInputHarness.with({ selector: '[type="search"]' }));
    await filter.setValue('grey');
    expect(await column('code')).toEqual(['RB-PEG']);
    await filter.setValue('motor');
    expect(await column('code')).toEqual(['RB-MOT']);
    await filter.setValue('nothing like this');
    expect(await column('code')).toEqual([]);
    const table = await loader.getHarness(MatTableHarness);
    expect(await (await table.host()).text()).toContain('No part matches');
    await filter.setValue('');
    expect((await column('code')).length).toBe(4);
  });

  it('sorts quantities as numbers and names as text', async () => {
    await setUp(PARTS, false);
    const sort = await loader.getHarness(MatSortHarness);
    const [qty] = await sort.getSortHeaders({ label: 'Qty per tub' });
    await qty!.click();
    // Numeric order, not text order (as text "40" would come before "4").
    expect(await column('qty')).toEqual(['1', '2', '4', '40']);
    await qty!.click();
    expect(await column('qty')).toEqual(['40', '4', '2', '1']);
    const [name] = await sort.getSortHeaders({ label: 'Name' });
    await name!.click();
    expect(await column('name')).toEqual([
      'Connector peg',
      'Drive motor',
      'Rover controller',
      'Wheel',
    ]);
  });

  it('pages a long list', async () => {
    const many = Array.from({ length: 30 }, (_, i) =>
      part({ id: `x${i}`, code: `X-${String(i).padStart(2, '0')}`, name: `Beam ${i}` }),
    );
    await setUp(many, false);
    expect((await column('code')).length).toBe(25);
    const paginator = await loader.getHarness(MatPaginatorHarness);
    await paginator.goToNextPage();
    expect(await column('code')).toEqual(['X-25', 'X-26', 'X-27', 'X-28', 'X-29']);
  });

  it('edits a row in place and emits only the changed fields', async () => {
    await setUp(PARTS, true);
    const saves: PartSave[] = [];
    fixture.componentInstance.save.subscribe((s) => saves.push(s));
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Edit RB-WHL"]' }))
    ).click();
    const qty = await loader.getHarness(
      MatInputHarness.with({ selector: '[aria-label="Qty per tub"]' }),
    );
    expect(await qty.getValue()).toBe('4');
    await qty.setValue('6');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save' }))).click();
    expect(saves.length).toBe(1);
    expect(saves[0]!.part.id).toBe('p4');
    expect(saves[0]!.change).toEqual({ qty: 6 });
  });

  it('refuses a fractional quantity with the message under the field', async () => {
    await setUp(PARTS, true);
    const saves: PartSave[] = [];
    fixture.componentInstance.save.subscribe((s) => saves.push(s));
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Edit RB-PEG"]' }))
    ).click();
    const qty = await loader.getHarness(
      MatInputHarness.with({ selector: '[aria-label="Qty per tub"]' }),
    );
    await qty.setValue('2.5');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save' }))).click();
    expect(saves).toEqual([]);
    expect(fixture.nativeElement.textContent).toContain('Use a whole number from 0 to 10000.');
  });

  it('adds a part in a new first row and emits every field of it', async () => {
    await setUp(PARTS, true);
    const added: NewPart[] = [];
    fixture.componentInstance.add.subscribe((p) => added.push(p));
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a part/ }))).click();
    expect((await column('code')).length).toBe(5);
    const field = (label: string) =>
      loader.getHarness(MatInputHarness.with({ selector: `[aria-label="${label}"]` }));
    await (await field('Code')).setValue('RB-RNG');
    await (await field('Name')).setValue('Spacer ring');
    await (await field('Qty per tub')).setValue('12');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add' }))).click();
    expect(added).toEqual([
      {
        code: 'RB-RNG',
        name: 'Spacer ring',
        colour: null,
        category: 'other',
        qty: 12,
        compartment: null,
        small: false,
        chargeMinutes: null,
      },
    ]);
    // The new row closes; the page adds the part and gives the new list.
    expect(await column('code')).toEqual(['RB-CTL', 'RB-MOT', 'RB-PEG', 'RB-WHL']);
  });

  it('a new part without a code or name is not sent; Cancel drops the row', async () => {
    await setUp(PARTS, true);
    const added: NewPart[] = [];
    fixture.componentInstance.add.subscribe((p) => added.push(p));
    await (await loader.getHarness(MatButtonHarness.with({ text: /Add a part/ }))).click();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add' }))).click();
    expect(added).toEqual([]);
    expect(fixture.nativeElement.textContent).toContain('Enter a part code.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
    expect(await column('code')).toEqual(['RB-CTL', 'RB-MOT', 'RB-PEG', 'RB-WHL']);
  });

  it('asks the page to remove a part from its row', async () => {
    await setUp(PARTS, true);
    const removed: Part[] = [];
    fixture.componentInstance.remove.subscribe((p) => removed.push(p));
    await (
      await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Remove RB-MOT"]' }))
    ).click();
    expect(removed.map((p) => p.id)).toEqual(['p2']);
  });
});
