import { formatBandCsv, parseBandCsv } from '../../server/engine/trip/bandCsv';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import { EXAMPLE_BAND } from '../../server/engine/trip/exampleDevices';

// Digitized band CSV (the product's own format, docs/MODEL-FORMAT.md, Devices: band). Values are invented.

describe('worked example: a digitized band CSV', () => {
  it('reads current,min_s,max_s with a header into ampere point lists', () => {
    const csv = 'current,min_s,max_s\n400,300,900\n1000,10,40\n4000,0.02,0.05\n';
    expect(parseBandCsv(csv)).toEqual({
      ok: true,
      currentUnit: 'ampere',
      min: [
        [400, 300],
        [1000, 10],
        [4000, 0.02],
      ],
      max: [
        [400, 900],
        [1000, 40],
        [4000, 0.05],
      ],
    });
  });

  it('reads multiple,min_s,max_s; leaves a curve out of a row with an empty cell; skips comments and blank lines', () => {
    const csv =
      '# digitized from a published band\nmultiple,min_s,max_s\n1.1,2000,\n1.25,,5000\n\n2,60,200\r\n10,0.02,0.05\n';
    const r = parseBandCsv(csv);
    expect(r).toEqual({
      ok: true,
      currentUnit: 'multiple',
      min: [
        [1.1, 2000],
        [2, 60],
        [10, 0.02],
      ],
      max: [
        [1.25, 5000],
        [2, 200],
        [10, 0.05],
      ],
    });
  });

  it('without a header the first column is amperes unless told otherwise', () => {
    const r = parseBandCsv('2,60,200\n10,0.02,0.05', { currentUnit: 'multiple' });
    expect(r.ok && r.currentUnit).toBe('multiple');
    expect(parseBandCsv('200,60,200\n1000,0.02,0.05').ok).toBe(true);
  });

  it('the uploader’s choice of unit decides; a header naming the other unit is refused on its line', () => {
    // A neutral "current" header under an explicit choice of multiples: read as multiples.
    const chosen = parseBandCsv('current,min_s,max_s\n2,60,200\n10,0.02,0.05\n', { currentUnit: 'multiple' });
    expect(chosen.ok && chosen.currentUnit).toBe('multiple');
    // A header saying multiples while amperes were chosen: an error naming line 1, no points taken.
    const conflict = parseBandCsv('multiple,min_s,max_s\n2,60,200\n10,0.02,0.05\n', { currentUnit: 'ampere' });
    expect(conflict.ok).toBe(false);
    if (!conflict.ok) {
      expect(conflict.errors[0]!.line).toBe(1);
      expect(conflict.errors[0]!.message).toMatch(/header says the first column holds multiples.*amperes was chosen/);
    }
    // The same header agreeing with the choice reads.
    const agree = parseBandCsv('amperes,min_s,max_s\n400,300,900\n4000,0.02,0.05\n', { currentUnit: 'ampere' });
    expect(agree.ok && agree.currentUnit).toBe('ampere');
  });

  it('round-trips a band through formatBandCsv and gives the same clearing times', () => {
    const parsed = parseBandCsv(formatBandCsv(EXAMPLE_BAND));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.min).toEqual(EXAMPLE_BAND.min);
    expect(parsed.max).toEqual(EXAMPLE_BAND.max);
    const again = { ...EXAMPLE_BAND, ...parsed };
    for (const a of [500, 900, 3000, 30000])
      expect(clearingTime(again, a).clearingTimeS).toBe(clearingTime(EXAMPLE_BAND, a).clearingTimeS);
  });
});

describe('bad CSV rows are reported by line', () => {
  function errors(csv: string) {
    const r = parseBandCsv(csv);
    if (r.ok) throw new Error('expected errors');
    return r.errors;
  }

  it('non-numeric, non-positive, unsorted and min > max rows, each with its line number', () => {
    const csv = [
      'current,min_s,max_s', // 1
      '100,50,100', // 2
      'abc,10,20', // 3 non-numeric current
      '200,-1,20', // 4 non-positive min
      '300,5,0', // 5 non-positive max
      '150,4,8', // 6 unsorted (after 300 on line 5, whose current is valid though its max is not)
      '400,9,3', // 7 min > max
      '500,2,x', // 8 non-numeric max
    ].join('\n');
    const e = errors(csv);
    expect(e.map((x) => x.line)).toEqual([3, 4, 5, 6, 7, 8]);
    expect(e[0].message).toMatch(/current "abc" is not a number/);
    expect(e[1].message).toMatch(/min_s -1 must be positive/);
    expect(e[2].message).toMatch(/max_s 0 must be positive/);
    expect(e[3].message).toMatch(/not greater than 300 on line 5/);
    expect(e[4].message).toMatch(/min_s 9 is greater than max_s 3/);
    expect(e[5].message).toMatch(/max_s "x" is not a number/);
  });

  it('a curve whose time rises with current is reported on the offending line', () => {
    const e = errors('current,min_s,max_s\n100,10,20\n200,15,18\n');
    expect(e).toEqual([{ line: 3, message: expect.stringMatching(/min_s 15 rises above 10 on line 2/) }]);
  });

  it('an unknown header, a short row and an empty file are reported', () => {
    expect(errors('amps,lo,hi\n100,1,2\n200,0.5,1')[0]).toEqual({ line: 1, message: expect.stringMatching(/Header/) });
    expect(errors('100,1,2\n200,0.5\n')[0]).toEqual({ line: 2, message: expect.stringMatching(/Expected 3 columns/) });
    expect(errors('').length).toBeGreaterThan(0);
  });
});
