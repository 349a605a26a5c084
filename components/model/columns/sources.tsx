/** Source fields (utility and generator). */
import { StyleSheet, View } from 'react-native';
import { space } from '../../theme';
import { NumCell, SegCell } from '../controls';
import { withField } from '../edit';
import { type SourceInput, type UtilityInput } from '../summaries';
import { type Column, numberColumn, idColumn, nameColumn, busColumn } from './shared';

const isUtility = (s: SourceInput): s is UtilityInput => s.kind === 'utility';

type GeneratorNumberKey =
  | 'kva'
  | 'kv'
  | 'subtransientPct'
  | 'transientPct'
  | 'synchronousPct'
  | 'sustainedCurrentMultiple'
  | 'subtransientTimeConstantS'
  | 'transientTimeConstantS';

function generatorNumber(
  key: GeneratorNumberKey,
  label: string,
  unit: string | undefined,
  width: number,
  hint?: string,
  optionalTypical = false,
): Column<SourceInput> {
  return numberColumn<SourceInput>(key, label, unit, width, {
    applies: (s) => s.kind === 'generator',
    get: (s) => (s.kind === 'generator' ? s[key] : undefined),
    set: (s, v) => (s.kind === 'generator' ? withField(s, key, v) : s),
    ...(hint ? { hint: () => hint } : {}),
    // Decrement data: empty means a typical value (from memory), flagged with a warning on the results.
    ...(optionalTypical ? { placeholder: (s: SourceInput) => (s.kind === 'generator' ? 'typical' : '—') } : {}),
  });
}

export const SOURCE_COLUMNS: Column<SourceInput>[] = [
  idColumn(),
  nameColumn(160),
  {
    key: 'kind',
    label: 'Kind',
    width: 176,
    basis: 220,
    issueKeys: ['kind'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <SegCell
        value={e.kind}
        options={[
          { value: 'utility', label: 'Utility' },
          { value: 'generator', label: 'Generator' },
        ]}
        onChange={(kind) =>
          patch((s) => {
            const base = { id: s.id, bus: s.bus, xr: s.xr, ...(s.name !== undefined ? { name: s.name } : {}) };
            return (kind === 'utility' ? { ...base, kind } : { ...base, kind }) as SourceInput;
          })
        }
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  busColumn<SourceInput>('bus', 'Bus', 140, (s, kv) =>
    s.kind === 'generator' && s.kv === undefined && kv !== undefined ? { ...s, kv } : s,
  ),
  {
    key: 'shortCircuit',
    label: 'Short circuit',
    width: 200,
    basis: 220,
    issueKeys: ['shortCircuitMva', 'shortCircuitKa'],
    applies: isUtility,
    hint: () => 'Available three-phase fault at the bus, in MVA or kA',
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      if (!isUtility(e)) return null;
      // The unit is the key present (a cleared value keeps its key, so the unit chosen stays).
      const unit = 'shortCircuitKa' in e && !('shortCircuitMva' in e) ? 'ka' : 'mva';
      const key = unit === 'ka' ? 'shortCircuitKa' : 'shortCircuitMva';
      return (
        <View style={styles.strengthRow}>
          <NumCell
            value={e[key]}
            onChange={(v) => patch((s) => ({ ...(s as UtilityInput), [key]: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={`${label} (${unit === 'ka' ? 'kA' : 'MVA'})`}
            style={styles.strengthValue}
          />
          <SegCell
            value={unit}
            options={[
              { value: 'mva', label: 'MVA' },
              { value: 'ka', label: 'kA' },
            ]}
            onChange={(u) =>
              patch((s) => {
                const { shortCircuitKa: _k, shortCircuitMva: _m, ...rest } = s as UtilityInput;
                return (
                  u === 'ka' ? { ...rest, shortCircuitKa: undefined } : { ...rest, shortCircuitMva: undefined }
                ) as SourceInput;
              })
            }
            size={size}
            editable={editable}
            testID={`${testID}-unit`}
            accessibilityLabel={`${label} unit`}
            style={styles.strengthUnit}
          />
        </View>
      );
    },
  },
  generatorNumber('kva', 'Rating', 'kVA', 100),
  generatorNumber('kv', 'Rated', 'kV', 90),
  generatorNumber('subtransientPct', 'X″d', '%', 84, 'Subtransient reactance on the machine rating'),
  numberColumn<SourceInput>('xr', 'X/R', undefined, 80),
  generatorNumber('transientPct', 'X′d', '%', 84, 'Transient reactance on the machine rating', true),
  generatorNumber(
    'synchronousPct',
    'Xd',
    '%',
    84,
    'Synchronous reactance on the machine rating (or give I sustained)',
    true,
  ),
  generatorNumber(
    'sustainedCurrentMultiple',
    'I sustained',
    '× rated',
    96,
    'Sustained fault current with excitation support, multiple of rated current (instead of Xd)',
  ),
  generatorNumber('subtransientTimeConstantS', 'T″d', 's', 84, 'Short-circuit subtransient time constant', true),
  generatorNumber('transientTimeConstantS', 'T′d', 's', 84, 'Short-circuit transient time constant', true),
];

const styles = StyleSheet.create({
  strengthRow: { flexDirection: 'row', gap: space.xs },
  strengthValue: { flex: 1 },
  strengthUnit: { width: 96 },
});
