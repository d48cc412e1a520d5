import type { PrepPlan } from '../../../shared/prep/index';
import { prefillPackAway } from './pack-away';

describe('prefillPackAway', () => {
  // An invented plan: group 1 lives in Tub 1 and borrows 2 of its 5 pegs from Tub 2.
  const plan = {
    groups: [
      {
        number: 1,
        homeTub: 'Tub 1',
        lines: [
          {
            partCode: 'PEG',
            needed: 5,
            allocated: 5,
            sources: [
              { tub: 'Tub 1', qty: 3 },
              { tub: 'Tub 2', qty: 2 },
            ],
          },
          { partCode: 'ROD', needed: 1, allocated: 1, sources: [{ tub: 'Tub 1', qty: 1 }] },
        ],
      },
    ],
  } as unknown as PrepPlan;
  const tubs = [
    { id: 't1', label: 'Tub 1' },
    { id: 't2', label: 'Tub 2' },
    { id: 't3', label: 'Tub 3' },
  ];

  it('charges a loss to the home tub first, then to the lender, and lists every tub', () => {
    const board = {
      groups: [
        {
          number: 1,
          lines: 2,
          linesOut: 2,
          linesBack: 2,
          missing: [{ partCode: 'PEG', count: 4 }],
        },
      ],
    };
    expect(prefillPackAway(plan, board, tubs)).toEqual([
      { tubId: 't1', label: 'Tub 1', missing: [{ partCode: 'PEG', count: 3 }] },
      { tubId: 't2', label: 'Tub 2', missing: [{ partCode: 'PEG', count: 1 }] },
      { tubId: 't3', label: 'Tub 3', missing: [] },
    ]);
  });

  it('leaves the lender whole when the loss fits in the home tub’s share (borrows go back)', () => {
    const board = {
      groups: [
        {
          number: 1,
          lines: 2,
          linesOut: 2,
          linesBack: 2,
          missing: [{ partCode: 'PEG', count: 2 }],
        },
      ],
    };
    expect(prefillPackAway(plan, board, tubs)[1]!.missing).toEqual([]);
  });
});
