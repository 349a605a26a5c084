/**
 * The comparison of two revisions (shared/revisionCompare.ts): which elements and fields changed, and the order in
 * which buses are listed. These are the product's own rules (no published source): a rise in hazard first, a bus the
 * newer revision cannot compute before everything (its hazard is unknown), floating-point noise is no change.
 */
import { compareBusResults, compareModels, labelChangeTexts, riseText } from '../../shared/revisionCompare';
import type { BusResult } from '../../shared/schemas/studyResults';

const bus = (busId: string, cal: number | null, ppe = 'PPE level 1', word: 'DANGER' | 'WARNING' = 'WARNING') =>
  ({
    busId,
    busName: busId,
    nominalKv: 0.48,
    status: cal === null ? 'error' : 'ok',
    boltedFaultKa: 20,
    xr: 5,
    cases: [],
    warnings: [],
    ...(cal === null
      ? { error: { code: 'X', message: 'failed' } }
      : {
          incidentEnergyCalPerCm2: cal,
          arcFlashBoundaryMm: 1000 * cal,
          labelValues: { ppeLevel: { name: ppe }, signalWord: word },
        }),
  }) as unknown as BusResult;

describe('compareModels', () => {
  it('finds added, removed and changed elements, nested fields by dotted path, lists whole', () => {
    const before = {
      name: 'Plant',
      buses: [{ id: 'B1', nominalKv: 0.48, equipment: { class: 'switchgear-lv', workingDistanceMm: 610 } }],
      devices: [{ id: 'R1', device: { kind: 'relay', timeDial: 2, curve: [[1, 2]] } }],
      cables: [{ id: 'C1', lengthM: 10 }],
    };
    const after = {
      name: 'Plant B',
      buses: [{ id: 'B1', nominalKv: 0.48, equipment: { class: 'switchgear-lv' } }],
      devices: [{ id: 'R1', name: 'Relay', device: { kind: 'relay', timeDial: 3, curve: [[1, 3]] } }],
      motors: [{ id: 'M1', hp: 50 }],
    };
    expect(compareModels(before, after)).toEqual([
      {
        kind: 'model',
        id: 'model',
        name: null,
        change: 'changed',
        fields: [{ field: 'name', before: 'Plant', after: 'Plant B' }],
      },
      {
        kind: 'buses',
        id: 'B1',
        name: null,
        change: 'changed',
        fields: [{ field: 'equipment.workingDistanceMm', before: 610 }],
      },
      { kind: 'cables', id: 'C1', name: null, change: 'removed', fields: [] },
      { kind: 'motors', id: 'M1', name: null, change: 'added', fields: [] },
      {
        kind: 'devices',
        id: 'R1',
        name: 'Relay',
        change: 'changed',
        fields: [
          { field: 'device.curve', before: '[[1,2]]', after: '[[1,3]]' },
          { field: 'device.timeDial', before: 2, after: 3 },
          { field: 'name', after: 'Relay' },
        ],
      },
    ]);
  });

  it('takes incomplete drafts as they are (no ids, not arrays, not objects)', () => {
    expect(compareModels(null, { buses: 'x' })).toEqual([]);
    expect(compareModels({ buses: [{ nominalKv: 1 }] }, { buses: [{ nominalKv: 2 }] })).toEqual([
      { kind: 'buses', id: '#1', name: null, change: 'changed', fields: [{ field: 'nominalKv', before: 1, after: 2 }] },
    ]);
  });
});

describe('compareBusResults', () => {
  it('lists a failing bus first, then the largest rise, and calls noise no change', () => {
    const before = [bus('A', 2), bus('B', 5), bus('C', 1), bus('D', 3), bus('GONE', 4)];
    const after = [bus('A', 2 * (1 + 1e-13)), bus('B', 9, 'PPE level 2'), bus('C', null), bus('D', 1), bus('NEW', 0.5)];
    const out = compareBusResults(before, after);
    expect(out.map((c) => [c.busId, c.change])).toEqual([
      ['C', 'changed'],
      ['B', 'changed'],
      ['NEW', 'added'],
      ['A', 'unchanged'],
      ['D', 'changed'],
      ['GONE', 'removed'],
    ]);
    const b = out.find((c) => c.busId === 'B')!;
    expect(b.energyRiseCalPerCm2).toBe(4);
    expect(b.energyRisePct).toBe(80);
    expect(riseText(b)).toBe('+4 cal/cm² (+80 %)');
    expect(labelChangeTexts(b)).toEqual(['PPE level 1 → PPE level 2']);
    expect(out.find((c) => c.busId === 'A')!.energyRiseCalPerCm2).toBe(0);
    expect(riseText(out.find((c) => c.busId === 'C')!)).toMatch(/^unknown/);
    expect(riseText(out.find((c) => c.busId === 'D')!)).toBe('−2 cal/cm² (−67 %)');
    expect(labelChangeTexts(out.find((c) => c.busId === 'NEW')!)).toEqual([
      'not labelled → PPE level 1',
      'not labelled → WARNING',
    ]);
  });
});
