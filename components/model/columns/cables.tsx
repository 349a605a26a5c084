/** Cable fields. */
import { CONDUCTOR_SIZES, normalizeConductorSize } from '../../../shared/schemas/model';
import { NumCell, PickCell, SegCell, type PickOption } from '../controls';
import { withField } from '../edit';
import { CONDUIT_LABELS, conductorSizeLabel, conductorSizeValue, type CableInput } from '../summaries';
import { type Column, numberColumn, idColumn, nameColumn, busColumn } from './shared';

const SIZE_OPTIONS: PickOption[] = CONDUCTOR_SIZES.map((s) => ({
  value: conductorSizeValue(s),
  label: conductorSizeLabel(s),
}));
const CONDUIT_OPTIONS: PickOption[] = Object.entries(CONDUIT_LABELS).map(([value, label]) => ({ value, label }));

const explicitRX = (c: CableInput) => c.rOhmPerKm !== undefined || c.xOhmPerKm !== undefined;
function tableData(c: CableInput): CableInput {
  return withField(withField(c, 'rOhmPerKm', undefined), 'xOhmPerKm', undefined);
}
function rxData(c: CableInput): CableInput {
  return withField(withField(withField(c, 'size', undefined), 'material', undefined), 'conduit', undefined);
}

const CABLE_TABLE_HINT = 'NEC Chapter 9 Table 9 values; entering R or X instead clears these';

export const CABLE_COLUMNS: Column<CableInput>[] = [
  idColumn(),
  nameColumn(160),
  busColumn<CableInput>('fromBus', 'From bus'),
  busColumn<CableInput>('toBus', 'To bus'),
  {
    // A length: shown in ft for US customary, stored in m (the unit system is the user's, see hooks/unitSystem.tsx).
    ...numberColumn<CableInput>('lengthM', 'Length', 'm', 90),
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <NumCell
        value={e.lengthM}
        onChange={(v) => patch((c) => withField(c as Record<string, unknown>, 'lengthM', v) as CableInput)}
        length="m"
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  numberColumn<CableInput>('sets', 'Sets', undefined, 70, {
    placeholder: () => '1',
    hint: () => 'Parallel conductors per phase',
  }),
  {
    key: 'size',
    label: 'Size',
    width: 130,
    basis: 130,
    issueKeys: ['size'],
    hint: (c) => (explicitRX(c) ? CABLE_TABLE_HINT : undefined),
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      const canonical = e.size !== undefined ? normalizeConductorSize(e.size) : null;
      return (
        <PickCell
          value={canonical ? conductorSizeValue(canonical) : e.size}
          options={SIZE_OPTIONS}
          title="Conductor size"
          placeholder={explicitRX(e) ? '—' : 'Choose'}
          onChange={(v) => patch((c) => ({ ...tableData(c), size: v }))}
          unknownHint="not in Table 9"
          size={size}
          invalid={invalid}
          editable={editable}
          testID={testID}
          accessibilityLabel={label}
        />
      );
    },
  },
  {
    key: 'material',
    label: 'Material',
    width: 104,
    basis: 120,
    issueKeys: ['material'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <SegCell
        value={e.material}
        options={[
          { value: 'Cu', label: 'Cu' },
          { value: 'Al', label: 'Al' },
        ]}
        onChange={(m) => patch((c) => ({ ...tableData(c), material: m }))}
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  {
    key: 'conduit',
    label: 'Conduit',
    width: 124,
    basis: 130,
    issueKeys: ['conduit'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <PickCell
        value={e.conduit}
        options={CONDUIT_OPTIONS}
        title="Conduit"
        placeholder={explicitRX(e) ? '—' : 'Choose'}
        onChange={(v) => patch((c) => ({ ...tableData(c), conduit: v as CableInput['conduit'] }))}
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  ...(['rOhmPerKm', 'xOhmPerKm'] as const).map((key): Column<CableInput> => ({
    key,
    label: key === 'rOhmPerKm' ? 'R' : 'X',
    unit: 'Ω/km',
    width: 92,
    basis: 110,
    issueKeys: [key],
    hint:
      key === 'rOhmPerKm'
        ? (c) =>
            explicitRX(c)
              ? 'One conductor of one set; entering a size instead clears R and X'
              : 'Or give R and X per km'
        : undefined,
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <NumCell
        value={e[key]}
        onChange={(v) => patch((c) => withField(v === undefined ? c : rxData(c), key, v))}
        placeholder={explicitRX(e) ? '' : '—'}
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  })),
];
