/** Motor fields. */
import { StyleSheet, View } from 'react-native';
import { space } from '../../theme';
import { NumCell, SegCell } from '../controls';
import { type MotorInput } from '../summaries';
import { type Column, numberColumn, idColumn, nameColumn, busColumn } from './shared';

export const MOTOR_COLUMNS: Column<MotorInput>[] = [
  idColumn(),
  nameColumn(170),
  busColumn<MotorInput>('bus', 'Bus', 160, (m, kv) => (m.kv === undefined && kv !== undefined ? { ...m, kv } : m)),
  {
    key: 'rating',
    label: 'Rating',
    width: 196,
    basis: 220,
    issueKeys: ['hp', 'kva'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      // The unit is the key present (a cleared value keeps its key, so the unit chosen stays).
      const unit = 'kva' in e && !('hp' in e) ? 'kva' : 'hp';
      return (
        <View style={styles.sizeRow}>
          <NumCell
            value={unit === 'kva' ? e.kva : e.hp}
            onChange={(v) => patch((m) => ({ ...m, [unit]: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={`${label} (${unit === 'kva' ? 'kVA' : 'hp'})`}
            style={styles.sizeValue}
          />
          <SegCell
            value={unit}
            options={[
              { value: 'hp', label: 'hp' },
              { value: 'kva', label: 'kVA' },
            ]}
            onChange={(u) =>
              patch((m) => {
                const { hp: _h, kva: _k, ...rest } = m;
                return { ...rest, [u]: undefined };
              })
            }
            size={size}
            editable={editable}
            testID={`${testID}-unit`}
            accessibilityLabel={`${label} unit`}
            style={styles.sizeUnit}
          />
        </View>
      );
    },
  },
  numberColumn<MotorInput>('kv', 'Rated', 'kV', 90),
  numberColumn<MotorInput>('lockedRotorMultiple', 'Locked rotor', '× FLC', 110, {
    placeholder: (m) => (m.subtransientPct === undefined ? 'typical' : '—'),
    hint: () => 'Or X″; empty: a typical value',
  }),
  numberColumn<MotorInput>('subtransientPct', 'X″', '%', 84, {
    placeholder: (m) => (m.lockedRotorMultiple === undefined ? 'typical' : '—'),
  }),
  numberColumn<MotorInput>('xr', 'X/R', undefined, 80, { placeholder: () => 'typical' }),
  numberColumn<MotorInput>('rpm', 'Speed', 'rpm', 90, {
    placeholder: (m) => (m.kv >= 1 ? '3600' : '—'),
    hint: (m) =>
      m.kv >= 1
        ? 'Medium voltage: 3600 rpm motors of 250 hp and up take the 1.0 first-cycle multiplier; empty: 3600 assumed'
        : undefined,
  }),
];

const styles = StyleSheet.create({
  sizeRow: { flexDirection: 'row', gap: space.xs },
  sizeValue: { flex: 1 },
  sizeUnit: { width: 96 },
});
