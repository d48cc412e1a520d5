/**
 * The controller a group pairs with, as the lesson page, the pack and the tray labels word it.
 * Rules from PREP-RULES.md (R5 controllers are allocated like any part, a borrowed piece goes
 * back to its own tub; a group short of a part gets none of it) and the pack's wording.
 */
import { describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { groupController, type PrepGroup } from '../../shared/prep/index.js';

const group = (lines: PrepGroup['lines'], controllerLabel: string | null = 'C-1'): PrepGroup =>
  ({
    number: 1,
    size: 3,
    homeTub: 'Tub 1',
    controllerLabel,
    lines,
    consumables: [],
    pieces: 0,
    returnablePieces: 0,
  }) as PrepGroup;
const line = (partCode: string, sources: { tub: string; qty: number }[]) =>
  ({ partCode, qty: 1, sources }) as unknown as PrepGroup['lines'][number];
const category = (code: string) => (code === 'CTL' ? 'controller' : 'motor');
const labels = new Map([
  ['Tub 1', 'C-1'],
  ['Tub 2', 'C-2'],
  ['Tub 3', null],
]);
const controllerOf = (tub: string) => labels.get(tub);

describe('groupController', () => {
  it('names the home tub’s controller when the group takes it from home', () => {
    assert.equal(
      groupController(group([line('CTL', [{ tub: 'Tub 1', qty: 1 }])]), category, controllerOf),
      'C-1',
    );
  });
  it('names the lending tub’s controller, and the tub, when it is borrowed', () => {
    assert.equal(
      groupController(group([line('CTL', [{ tub: 'Tub 2', qty: 1 }])]), category, controllerOf),
      'C-2 (from Tub 2)',
    );
    assert.equal(
      groupController(group([line('CTL', [{ tub: 'Tub 3', qty: 1 }])]), category, controllerOf),
      'not labelled (from Tub 3)',
    );
  });
  it('says "none (short)" when the group needs a controller and gets none', () => {
    assert.equal(groupController(group([line('CTL', [])]), category, controllerOf), 'none (short)');
  });
  it('claims nothing it cannot name: an unlabelled home controller is null', () => {
    assert.equal(
      groupController(
        group([line('CTL', [{ tub: 'Tub 1', qty: 1 }])], null),
        category,
        controllerOf,
      ),
      null,
    );
    assert.equal(
      groupController(
        group([line('MOT', [{ tub: 'Tub 1', qty: 2 }])], null),
        category,
        controllerOf,
      ),
      null,
    );
  });
});
