/**
 * Lengths are stored in SI (mm, m) and shown in the user's unit system (hooks/units.ts): showing a value, switching
 * US customary ↔ SI any number of times and reading an unedited field back must give the stored value exactly; an
 * edited field stores exactly the converted number typed. 1 in = 25.4 mm and 1 ft = 0.3048 m exactly (international
 * yard and pound agreement, 1959).
 */
import * as fc from 'fast-check';
import {
  fromShown,
  lengthReading,
  lengthText,
  readLengthText,
  shownUnit,
  type StoredLength,
  type UnitSystem,
} from '../../hooks/units';

const stored = fc.constantFrom<StoredLength>('mm', 'm');
const system = fc.constantFrom<UnitSystem>('us', 'si');
const positive = fc.double({ min: 1e-3, max: 1e6, noNaN: true, noDefaultInfinity: true });

/** A field as the editor and the spot check keep it: the text shown and the value behind it. */
function show(value: number | undefined, unit: StoredLength, sys: UnitSystem) {
  const text = lengthText(value, unit, sys);
  return { text, value };
}

/** Switches the unit system of an unedited field: read it back in the old system, show it in the new one. */
function switchTo(
  field: { text: string; value: number | undefined },
  unit: StoredLength,
  from: UnitSystem,
  to: UnitSystem,
) {
  const value = readLengthText(field.text, field, unit, from);
  return show(value, unit, to);
}

describe('unit switches never change a stored length', () => {
  it('32 mm shown in inches and back is still 32 mm (the reported case: it became 33 mm)', () => {
    let f = show(32, 'mm', 'si');
    f = switchTo(f, 'mm', 'si', 'us');
    expect(f.text).toBe('1.26');
    f = switchTo(f, 'mm', 'us', 'si');
    expect(f.text).toBe('32');
    expect(readLengthText(f.text, f, 'mm', 'si')).toBe(32);
  });

  it('any value survives any sequence of switches unchanged (property)', () => {
    fc.assert(
      fc.property(positive, stored, system, fc.array(system, { maxLength: 12 }), (v, unit, start, switches) => {
        let f = show(v, unit, start);
        let sys = start;
        for (const next of switches) {
          f = switchTo(f, unit, sys, next);
          sys = next;
          expect(f.value).toBe(v);
        }
        expect(readLengthText(f.text, f, unit, sys)).toBe(v);
      }),
    );
  });

  it('display then parse of an unedited field returns the stored value exactly (property)', () => {
    fc.assert(
      fc.property(positive, stored, system, (v, unit, sys) => {
        const f = show(v, unit, sys);
        expect(readLengthText(f.text, f, unit, sys)).toBe(v);
      }),
    );
  });

  it('an edited field stores exactly the converted number typed (no rounding of the stored value)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 100000 }), stored, system, (hundredths, unit, sys) => {
        const typed = hundredths / 100;
        const f = show(12345.678, unit, sys);
        const got = readLengthText(String(typed), f, unit, sys);
        expect(got).toBe(fromShown(typed, unit, sys));
        if (sys === 'si') expect(got).toBe(typed);
      }),
    );
    // 36 in = 914.4 mm and 100 ft = 30.48 m exactly (1959 definitions).
    expect(readLengthText('36', show(900, 'mm', 'us'), 'mm', 'us')).toBeCloseTo(914.4, 10);
    expect(readLengthText('100', show(30, 'm', 'us'), 'm', 'us')).toBeCloseTo(30.48, 10);
  });

  it('the unit shown is in / ft for US customary and the stored unit for SI', () => {
    expect(shownUnit('mm', 'us')).toBe('in');
    expect(shownUnit('m', 'us')).toBe('ft');
    expect(shownUnit('mm', 'si')).toBe('mm');
    expect(shownUnit('m', 'si')).toBe('m');
    // 25 m / 0.3048 = 82.0209… ft, read to two decimals; SI as stored.
    expect(lengthReading(25, 'm', 'us')).toBe('82.02 ft');
    expect(lengthReading(25, 'm', 'si')).toBe('25 m');
    expect(lengthReading(undefined, 'mm', 'us')).toBe('—');
  });
});
