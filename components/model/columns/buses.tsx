/** Bus fields. */
import React from 'react';
import { StyleSheet, View } from 'react-native';
import {
  ELECTRODE_CONFIGS,
  ELECTRODE_CONFIG_LABELS,
  EQUIPMENT_CLASSES,
  findEquipmentClass,
} from '../../../shared/equipmentClasses';
import { colors, space } from '../../theme';
import { T } from '../../ui';
import { NumCell, PickCell, SegCell, TextCell, type PickOption } from '../controls';
import { withField } from '../edit';
import { num, shortClassLabel, type BusInput, type EquipmentInput } from '../summaries';
import { type Column, numberColumn, idColumn, nameColumn } from './shared';

const CLASS_OPTIONS: PickOption[] = EQUIPMENT_CLASSES.map((c) => {
  const bits: string[] = [];
  if (c.gapMm !== null) bits.push(`gap ${num(c.gapMm)} mm`);
  if (c.workingDistanceMm !== null) bits.push(`working distance ${num(c.workingDistanceMm)} mm`);
  bits.push(
    c.enclosureMm
      ? `${num(c.enclosureMm.height)} × ${num(c.enclosureMm.width)} × ${num(c.enclosureMm.depth)} mm`
      : 'open air',
  );
  return {
    value: c.id,
    label: c.label,
    short: shortClassLabel(c.label),
    detail: `${c.electrodeConfig} · ${bits.join(' · ')}`,
  };
});

const ELECTRODE_OPTIONS: PickOption[] = ELECTRODE_CONFIGS.map((c) => ({
  value: c,
  label: c,
  detail: ELECTRODE_CONFIG_LABELS[c],
}));

const equipmentOf = (b: BusInput) => b.equipment;

type MainIsolation = 'isolated' | 'not-isolated' | 'unstated';
const MAIN_ISOLATION_OPTIONS: readonly { value: MainIsolation; label: string }[] = [
  { value: 'isolated', label: 'Isolated' },
  { value: 'not-isolated', label: 'Not isolated' },
  { value: 'unstated', label: 'Not stated' },
];
const mainIsolationOf = (b: BusInput): MainIsolation =>
  b.equipment?.mainIsolated === true ? 'isolated' : b.equipment?.mainIsolated === false ? 'not-isolated' : 'unstated';
type CapChoice = 'study' | 'own' | 'none';
const CAP_OPTIONS: readonly { value: CapChoice; label: string }[] = [
  { value: 'study', label: 'Study' },
  { value: 'own', label: 'Own' },
  { value: 'none', label: 'None' },
];
const capChoiceOf = (b: BusInput): CapChoice =>
  b.equipment?.arcDurationCapS === undefined ? 'study' : b.equipment.arcDurationCapS === null ? 'none' : 'own';
const classOf = (b: BusInput) => (b.equipment ? findEquipmentClass(b.equipment.class) : undefined);

function patchEquipment<K extends keyof EquipmentInput>(
  b: BusInput,
  key: K,
  value: EquipmentInput[K] | undefined,
): BusInput {
  if (!b.equipment) return b;
  return { ...b, equipment: withField(b.equipment, key, value) };
}

type Dim = 'height' | 'width' | 'depth';
const DIMS: Dim[] = ['height', 'width', 'depth'];

/** Sets one enclosure dimension. The first dimension set starts from the class's typical box; all empty = typical. */
function patchEnclosure(b: BusInput, dim: Dim, value: number | undefined): BusInput {
  const eq = b.equipment;
  if (!eq) return b;
  const typical = findEquipmentClass(eq.class)?.enclosureMm ?? undefined;
  const current: Partial<Record<Dim, number>> = eq.enclosureMm ? { ...eq.enclosureMm } : typical ? { ...typical } : {};
  if (value === undefined) delete current[dim];
  else current[dim] = value;
  const empty = DIMS.every((d) => current[d] === undefined);
  const allTypical = typical !== undefined && DIMS.every((d) => current[d] === typical[d]);
  if (empty || allTypical) return patchEquipment(b, 'enclosureMm', undefined);
  return patchEquipment(b, 'enclosureMm', current as EquipmentInput['enclosureMm']);
}

const TYPICAL = 'Empty: typical value of the class';

export const BUS_COLUMNS: Column<BusInput>[] = [
  idColumn(),
  nameColumn(),
  numberColumn<BusInput>('nominalKv', 'Nominal', 'kV', 96, { basis: 110 }),
  {
    key: 'class',
    label: 'Equipment class',
    width: 232,
    basis: 260,
    issueKeys: ['equipment', 'equipment.class'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <PickCell
        value={e.equipment?.class}
        options={CLASS_OPTIONS}
        emptyLabel="None (not evaluated)"
        title="Equipment class"
        onChange={(v) =>
          patch((b) =>
            v === '' ? withField(b, 'equipment', undefined) : { ...b, equipment: { ...(b.equipment ?? {}), class: v } },
          )
        }
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
    hint: (b) =>
      b.equipment
        ? 'Typical gap, enclosure and working distance (IEEE 1584-2018) apply where the fields are empty'
        : undefined,
  },
  {
    key: 'electrode',
    label: 'Electrodes',
    formLabel: 'Electrode configuration',
    width: 140,
    basis: 150,
    issueKeys: ['equipment.electrodeConfig'],
    applies: (b) => !!equipmentOf(b),
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <PickCell
        value={e.equipment?.electrodeConfig}
        options={ELECTRODE_OPTIONS}
        emptyLabel={`Typical of the class (${classOf(e)?.electrodeConfig ?? '—'})`}
        emptyShort={
          size === 'cell' ? (classOf(e)?.electrodeConfig ?? '—') : `Typical (${classOf(e)?.electrodeConfig ?? '—'})`
        }
        title="Electrode configuration"
        onChange={(v) =>
          patch((b) =>
            patchEquipment(b, 'electrodeConfig', v === '' ? undefined : (v as EquipmentInput['electrodeConfig'])),
          )
        }
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  {
    key: 'gap',
    label: 'Gap',
    unit: 'mm',
    width: 84,
    basis: 100,
    issueKeys: ['equipment.gapMm'],
    applies: (b) => !!equipmentOf(b),
    hint: (b) => (classOf(b)?.gapMm === null ? 'No typical value: enter the measured gap' : TYPICAL),
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      const typical = classOf(e)?.gapMm;
      return (
        <NumCell
          value={e.equipment?.gapMm}
          onChange={(v) => patch((b) => patchEquipment(b, 'gapMm', v))}
          length="mm"
          typical={typical}
          placeholder="enter"
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
    key: 'workingDistance',
    label: 'Working dist.',
    formLabel: 'Working distance',
    unit: 'mm',
    width: 104,
    basis: 120,
    issueKeys: ['equipment.workingDistanceMm'],
    applies: (b) => !!equipmentOf(b),
    hint: (b) => (classOf(b)?.workingDistanceMm === null ? 'No typical value: enter the working distance' : undefined),
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      const typical = classOf(e)?.workingDistanceMm;
      return (
        <NumCell
          value={e.equipment?.workingDistanceMm}
          onChange={(v) => patch((b) => patchEquipment(b, 'workingDistanceMm', v))}
          length="mm"
          typical={typical}
          placeholder="enter"
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
    key: 'enclosure',
    label: 'Enclosure H × W × D',
    unit: 'mm',
    width: 246,
    basis: 280,
    issueKeys: ['equipment.enclosureMm'],
    applies: (b) => !!equipmentOf(b),
    hint: (b) =>
      classOf(b)?.enclosureMm === null ? 'Open air: no enclosure correction' : 'Empty: typical enclosure of the class',
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      const typical = classOf(e)?.enclosureMm;
      const box = e.equipment?.enclosureMm as Partial<Record<Dim, number>> | undefined;
      return (
        <View style={styles.enclosure}>
          {DIMS.map((d, i) => (
            <React.Fragment key={d}>
              {i > 0 ? <T style={styles.enclosureTimes}>×</T> : null}
              <NumCell
                value={box?.[d]}
                onChange={(v) => patch((b) => patchEnclosure(b, d, v))}
                length="mm"
                typical={typical ? typical[d] : undefined}
                placeholder={typical === null ? 'none' : ''}
                size={size}
                invalid={invalid && (box?.[d] === undefined || !box)}
                editable={editable}
                testID={`${testID}-${d}`}
                accessibilityLabel={`${label} ${d}`}
                style={styles.enclosureDim}
              />
            </React.Fragment>
          ))}
        </View>
      );
    },
  },
  {
    key: 'mainIsolated',
    label: 'Main device',
    formLabel: 'Main device isolated from the bus?',
    width: 250,
    basis: 320,
    issueKeys: ['equipment.mainIsolated'],
    // Shown where a main sits at the bus (or a value was stated before); elsewhere there is no line side to evaluate.
    applies: (b, ctx) =>
      !!equipmentOf(b) && ((ctx.busMains.get(b.id)?.length ?? 0) > 0 || b.equipment?.mainIsolated !== undefined),
    hint: (b, ctx) => {
      const mains = ctx.busMains.get(b.id)?.join(', ');
      const v = b.equipment?.mainIsolated;
      if (v === true)
        return `Isolated: an arc at the bus is cleared by its main; no line-side case${mains ? ` (devices here: ${mains})` : ''}`;
      if (v === false)
        return 'Not isolated: an arc on the line side of the main is cleared by the next device upstream; both sides are evaluated';
      return 'Not stated: treated as not isolated — the line side is evaluated (the higher hazard) and the result says so';
    },
    render: ({ e, size, editable, patch, testID, label }) => (
      <SegCell<MainIsolation>
        value={mainIsolationOf(e)}
        options={MAIN_ISOLATION_OPTIONS}
        onChange={(v) =>
          patch((b) =>
            patchEquipment(b, 'mainIsolated', v === 'isolated' ? true : v === 'not-isolated' ? false : undefined),
          )
        }
        size={size}
        editable={editable}
        testID={testID}
        accessibilityLabel={`${label}: main device isolated from the bus`}
      />
    ),
  },
  {
    key: 'arcDurationCap',
    label: 'Arc-duration cap',
    formLabel: 'Arc-duration cap at this bus',
    width: 380,
    basis: 420,
    issueKeys: ['equipment.arcDurationCapS', 'equipment.arcDurationCapReason'],
    applies: (b) => !!equipmentOf(b),
    hint: (b) => {
      const c = capChoiceOf(b);
      if (c === 'study') return "The study's cap (2 s unless the organization sets another)";
      if (c === 'none') return 'No cap: the clearing time stands, however long. Give the reason';
      return 'Own cap for this bus (e.g. escape not possible). Give the reason';
    },
    render: ({ e, size, invalid, editable, patch, testID, label }) => {
      const c = capChoiceOf(e);
      return (
        <View style={styles.cap}>
          <SegCell<CapChoice>
            value={c}
            options={CAP_OPTIONS}
            onChange={(v) =>
              patch((b) =>
                patchEquipment(
                  b,
                  'arcDurationCapS',
                  v === 'study' ? undefined : v === 'none' ? null : (b.equipment?.arcDurationCapS ?? 2),
                ),
              )
            }
            size={size}
            editable={editable}
            testID={testID}
            accessibilityLabel={`${label}: arc-duration cap`}
            style={styles.capChoice}
          />
          {c === 'own' ? (
            <NumCell
              value={e.equipment?.arcDurationCapS ?? undefined}
              onChange={(v) => patch((b) => patchEquipment(b, 'arcDurationCapS', v ?? Number.NaN))}
              placeholder="s"
              size={size}
              invalid={invalid}
              editable={editable}
              testID={`${testID}-seconds`}
              accessibilityLabel={`${label} arc-duration cap, seconds`}
              style={styles.capSeconds}
            />
          ) : null}
          {c !== 'study' ? (
            <TextCell
              value={e.equipment?.arcDurationCapReason}
              onChange={(v) => patch((b) => patchEquipment(b, 'arcDurationCapReason', v === '' ? undefined : v))}
              placeholder="Reason (required)"
              size={size}
              invalid={invalid && !e.equipment?.arcDurationCapReason}
              editable={editable}
              testID={`${testID}-reason`}
              accessibilityLabel={`${label} arc-duration cap reason`}
              style={styles.capReason}
            />
          ) : null}
        </View>
      );
    },
  },
];

const styles = StyleSheet.create({
  enclosure: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  enclosureTimes: { color: colors.muted, fontSize: 13 },
  enclosureDim: { flex: 1 },
  cap: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  capChoice: { width: 150 },
  capSeconds: { width: 64 },
  capReason: { flex: 1 },
});
