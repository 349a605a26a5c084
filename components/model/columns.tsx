/**
 * The fields of each element kind, written once and shown two ways: as the cells of a table row (wide screens) and
 * as the labelled fields of a phone card. Each field names the issue fields it shows (`issueKeys`), so a
 * `ModelIssue` for `cables[2].toBus` lands beside the "To bus" input.
 */
import React from 'react';
import { Pressable, View } from 'react-native';
import {
  ELECTRODE_CONFIGS,
  ELECTRODE_CONFIG_LABELS,
  EQUIPMENT_CLASSES,
  findEquipmentClass,
} from '../../shared/equipmentClasses';
import type { DeviceType } from '../../shared/schemas/deviceLibrary';
import type { Device } from '../../shared/schemas/device';
import { CONDUCTOR_SIZES, normalizeConductorSize } from '../../shared/schemas/model';
import { colors, fonts, space } from '../theme';
import { T } from '../ui';
import { NumCell, PickCell, SegCell, TextCell, type PickOption, type Size } from './controls';
import { withField } from './edit';
import {
  CONDUIT_LABELS,
  conductorSizeLabel,
  conductorSizeValue,
  deviceKindLabel,
  deviceSettingsSummary,
  num,
  shortClassLabel,
  type BusInput,
  type CableInput,
  type CollectionKey,
  type ElementOf,
  type EquipmentInput,
  type GeneratorInput,
  type MotorInput,
  type PlacedDeviceInput,
  type SourceInput,
  type TieInput,
  type TransformerInput,
  type UtilityInput,
} from './summaries';

/** What the fields of a section need from the rest of the model (kept per section, so rows re-render rarely). */
export interface EditorContext {
  busOptions: readonly PickOption[];
  busKv: ReadonlyMap<string, number>;
  locationOptions: readonly PickOption[];
  branchBuses: ReadonlyMap<string, { from: string; to: string }>;
  typeOptions: readonly PickOption[];
  typesById: ReadonlyMap<string, DeviceType>;
  /** Buses section: the devices at each bus's end of a branch (its possible main devices). */
  busMains: ReadonlyMap<string, readonly string[]>;
}

export const EMPTY_CONTEXT: EditorContext = {
  busOptions: [],
  busKv: new Map(),
  locationOptions: [],
  branchBuses: new Map(),
  typeOptions: [],
  typesById: new Map(),
  busMains: new Map(),
};

export interface CellProps<E> {
  e: E;
  size: Size;
  invalid: boolean;
  editable: boolean;
  patch: (update: (e: E) => E) => void;
  rename: (id: string) => void;
  ctx: EditorContext;
  testID: string;
  /** Accessible name of the input ("SWGR-A gap"). */
  label: string;
}

export interface Column<E> {
  key: string;
  label: string;
  /** Longer label on a phone card, where there is room. */
  formLabel?: string;
  unit?: string;
  /** Width of the table column, px. */
  width: number;
  /** Flex basis of the field on a phone card, px (wider fields take a line of their own). */
  basis?: number;
  issueKeys: readonly string[];
  /** False where the field does not apply to this element (hidden on a card, a dash in the table). */
  applies?: (e: E, ctx: EditorContext) => boolean;
  hint?: (e: E, ctx: EditorContext) => string | undefined;
  render: (p: CellProps<E>) => React.ReactNode;
}

// ---------------------------------------------------------------------------------------------
// Building blocks

type Keyed<E> = { [K in keyof E]-?: E[K] extends number | undefined ? K : never }[keyof E];

interface NumberExtra<E> extends Partial<Column<E>> {
  placeholder?: (e: E) => string | undefined;
  /** For fields not shared by every member of a union (generator kVA): read and write explicitly. */
  get?: (e: E) => number | undefined;
  set?: (e: E, v: number | undefined) => E;
}

function numberColumn<E extends object>(
  key: Keyed<E> & string,
  label: string,
  unit: string | undefined,
  width: number,
  extra?: NumberExtra<E>,
): Column<E>;
function numberColumn<E extends object>(
  key: string,
  label: string,
  unit: string | undefined,
  width: number,
  extra: NumberExtra<E> & Required<Pick<NumberExtra<E>, 'get' | 'set'>>,
): Column<E>;
function numberColumn<E extends object>(
  key: string,
  label: string,
  unit: string | undefined,
  width: number,
  extra: NumberExtra<E> = {},
): Column<E> {
  const { placeholder, get, set, ...rest } = extra;
  const read = get ?? ((e: E) => (e as Record<string, unknown>)[key] as number | undefined);
  const write = set ?? ((e: E, v: number | undefined) => withField(e as Record<string, unknown>, key, v) as E);
  return {
    key,
    label,
    unit,
    width,
    issueKeys: [key],
    render: ({ e, size, invalid, editable, patch, testID, label: a11y }) => (
      <NumCell
        value={read(e)}
        onChange={(v) => patch((x) => write(x, v))}
        size={size}
        invalid={invalid}
        editable={editable}
        placeholder={placeholder?.(e)}
        testID={testID}
        accessibilityLabel={a11y}
      />
    ),
    ...rest,
  };
}

function idColumn<E extends { id: string }>(width = 128): Column<E> {
  return {
    key: 'id',
    label: 'Id',
    width,
    basis: 130,
    issueKeys: ['id'],
    render: ({ e, size, invalid, editable, rename, testID }) => (
      <TextCell
        value={e.id}
        onChange={rename}
        commit="blur"
        mono
        size={size}
        invalid={invalid}
        editable={editable}
        placeholder="Id"
        testID={testID}
        accessibilityLabel="Id"
      />
    ),
  };
}

function nameColumn<E extends { name?: string }>(width = 180): Column<E> {
  return {
    key: 'name',
    label: 'Name',
    width,
    basis: 180,
    issueKeys: ['name'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <TextCell
        value={e.name}
        onChange={(v) => patch((x) => withField(x, 'name', (v === '' ? undefined : v) as E['name']))}
        size={size}
        invalid={invalid}
        editable={editable}
        placeholder="Optional"
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  };
}

/** A bus reference picked from the model's buses; `onPicked` may fill a voltage left empty. */
function busColumn<E extends object>(
  key: keyof E & string,
  label: string,
  width = 160,
  onPicked?: (e: E, busKv: number | undefined) => E,
): Column<E> {
  return {
    key,
    label,
    width,
    basis: 150,
    issueKeys: [key],
    render: ({ e, size, invalid, editable, patch, ctx, testID, label: a11y }) => (
      <PickCell
        value={e[key] as string | undefined}
        options={ctx.busOptions}
        title={`${label}: choose a bus`}
        placeholder="Choose bus"
        onChange={(v) =>
          patch((x) => {
            const next = { ...x, [key]: v } as E;
            return onPicked ? onPicked(next, ctx.busKv.get(v)) : next;
          })
        }
        unknownHint="unknown bus"
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={a11y}
      />
    ),
  };
}

// ---------------------------------------------------------------------------------------------
// Buses

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
          placeholder={typical != null ? num(typical) : 'enter'}
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
          placeholder={typical != null ? num(typical) : 'enter'}
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
        <View style={{ flexDirection: 'row', alignItems: 'center', gap: 4 }}>
          {DIMS.map((d, i) => (
            <React.Fragment key={d}>
              {i > 0 ? <T style={{ color: colors.muted, fontSize: 13 }}>×</T> : null}
              <NumCell
                value={box?.[d]}
                onChange={(v) => patch((b) => patchEnclosure(b, d, v))}
                placeholder={typical ? num(typical[d]) : typical === null ? 'none' : ''}
                size={size}
                invalid={invalid && (box?.[d] === undefined || !box)}
                editable={editable}
                testID={`${testID}-${d}`}
                accessibilityLabel={`${label} ${d}`}
                style={{ flex: 1 }}
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
        <View style={{ flexDirection: 'row', alignItems: 'center', gap: 4 }}>
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
            style={{ width: 150 }}
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
              style={{ width: 64 }}
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
              style={{ flex: 1 }}
            />
          ) : null}
        </View>
      );
    },
  },
];

// ---------------------------------------------------------------------------------------------
// Sources

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
        <View style={{ flexDirection: 'row', gap: 4 }}>
          <NumCell
            value={e[key]}
            onChange={(v) => patch((s) => ({ ...(s as UtilityInput), [key]: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={`${label} (${unit === 'ka' ? 'kA' : 'MVA'})`}
            style={{ flex: 1 }}
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
            style={{ width: 96 }}
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

// ---------------------------------------------------------------------------------------------
// Transformers

export const TRANSFORMER_COLUMNS: Column<TransformerInput>[] = [
  idColumn(),
  nameColumn(170),
  busColumn<TransformerInput>('fromBus', 'Primary bus', 160, (t, kv) =>
    t.primaryKv === undefined && kv !== undefined ? { ...t, primaryKv: kv } : t,
  ),
  busColumn<TransformerInput>('toBus', 'Secondary bus', 160, (t, kv) =>
    t.secondaryKv === undefined && kv !== undefined ? { ...t, secondaryKv: kv } : t,
  ),
  numberColumn<TransformerInput>('kva', 'Rating', 'kVA', 100),
  numberColumn<TransformerInput>('primaryKv', 'Primary', 'kV', 90),
  numberColumn<TransformerInput>('secondaryKv', 'Secondary', 'kV', 96),
  numberColumn<TransformerInput>('impedancePct', 'Impedance', '%Z', 96),
  numberColumn<TransformerInput>('xr', 'X/R', undefined, 80, {
    placeholder: () => 'typical',
    hint: (t) => (t.xr === undefined ? 'Empty: a typical value by size, with a warning' : undefined),
  }),
];

// ---------------------------------------------------------------------------------------------
// Cables

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
  numberColumn<CableInput>('lengthM', 'Length', 'm', 90),
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

// ---------------------------------------------------------------------------------------------
// Motors

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
        <View style={{ flexDirection: 'row', gap: 4 }}>
          <NumCell
            value={unit === 'kva' ? e.kva : e.hp}
            onChange={(v) => patch((m) => ({ ...m, [unit]: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={`${label} (${unit === 'kva' ? 'kVA' : 'hp'})`}
            style={{ flex: 1 }}
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
            style={{ width: 96 }}
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

// ---------------------------------------------------------------------------------------------
// Ties

export const TIE_COLUMNS: Column<TieInput>[] = [
  idColumn(),
  nameColumn(),
  busColumn<TieInput>('fromBus', 'From bus'),
  busColumn<TieInput>('toBus', 'To bus'),
  {
    key: 'closed',
    label: 'State',
    width: 170,
    basis: 200,
    issueKeys: ['closed'],
    render: ({ e, size, invalid, editable, patch, testID, label }) => (
      <SegCell
        value={e.closed === false ? 'open' : 'closed'}
        options={[
          { value: 'closed', label: 'Closed' },
          { value: 'open', label: 'Open' },
        ]}
        onChange={(v) => patch((t) => ({ ...t, closed: v === 'closed' }))}
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
];

// ---------------------------------------------------------------------------------------------
// Devices

/** The location picker's value: `branch:TX-1` or `source:UTIL-1`. */
export function locationValue(d: PlacedDeviceInput): string {
  if (d.branch !== undefined) return d.branch === '' ? '' : `branch:${d.branch}`;
  if (d.source !== undefined) return d.source === '' ? '' : `source:${d.source}`;
  return '';
}

/** The library type's device differs from the one stored in the model (the type was edited since). */
export function libraryChanged(d: PlacedDeviceInput, t: DeviceType | undefined): boolean {
  return !!t && !!d.device && JSON.stringify(t.device) !== JSON.stringify(d.device);
}

export function fromLibrary(d: PlacedDeviceInput, t: DeviceType): PlacedDeviceInput {
  return {
    ...d,
    device: t.device,
    library: {
      deviceTypeId: t.id,
      name: t.name,
      ...(t.definition.kind === 'electronic' ? { positions: t.definition.positions } : {}),
    },
  };
}

export const DEVICE_COLUMNS: Column<PlacedDeviceInput>[] = [
  idColumn(120),
  nameColumn(150),
  {
    key: 'location',
    label: 'Location',
    width: 140,
    basis: 170,
    issueKeys: ['branch', 'source'],
    hint: () => 'A branch end, or a source or motor',
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => (
      <PickCell
        value={locationValue(e)}
        options={ctx.locationOptions}
        title="Where the device sits"
        placeholder="Choose"
        formatUnknown={(v) => v.replace(/^(branch|source):/, '')}
        unknownHint="unknown"
        onChange={(v) =>
          patch((d) => {
            const [kind, id] = [v.slice(0, v.indexOf(':')), v.slice(v.indexOf(':') + 1)];
            const { branch: _b, source: _s, end, ...rest } = d;
            return kind === 'branch' ? { ...rest, branch: id, end: end ?? 'from' } : { ...rest, source: id };
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
  {
    key: 'end',
    label: 'End',
    width: 120,
    basis: 200,
    issueKeys: ['end'],
    applies: (d) => d.branch !== undefined,
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => {
      const buses = e.branch ? ctx.branchBuses.get(e.branch) : undefined;
      const long = size === 'form' && buses;
      const at = buses && e.end ? buses[e.end] : undefined;
      return (
        <View style={{ gap: 2 }}>
          <SegCell
            value={e.end}
            options={[
              { value: 'from', label: long ? `From · ${buses.from}` : 'From' },
              { value: 'to', label: long ? `To · ${buses.to}` : 'To' },
            ]}
            onChange={(v) => patch((d) => ({ ...d, end: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={label}
          />
          {size === 'cell' && at ? (
            <T numberOfLines={1} style={{ fontSize: 12, lineHeight: 16, color: colors.muted, textAlign: 'center' }}>
              {`at ${at}`}
            </T>
          ) : null}
        </View>
      );
    },
  },
  {
    key: 'type',
    label: 'Device type and settings',
    formLabel: 'Device type',
    width: 300,
    basis: 300,
    issueKeys: ['device', 'library'],
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => {
      const device = e.device as Device | undefined;
      const t = e.library ? ctx.typesById.get(e.library.deviceTypeId) : undefined;
      const changed = libraryChanged(e, t);
      return (
        <View style={{ gap: 3 }}>
          <PickCell
            value={e.library?.deviceTypeId}
            options={ctx.typeOptions}
            title="Device type from the library"
            placeholder={e.device ? 'Custom (not from the library)' : 'Choose from the library'}
            formatUnknown={() => e.library?.name ?? 'Unknown type'}
            unknownHint="not in the library"
            onChange={(v) => {
              const type = ctx.typesById.get(v);
              if (type) patch((d) => fromLibrary(d, type));
            }}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={label}
          />
          {device ? (
            <T
              numberOfLines={size === 'cell' ? 2 : undefined}
              style={{ fontSize: 13, lineHeight: 18, color: colors.inkSoft, paddingHorizontal: 2 }}
              testID={`${testID}-summary`}
            >
              <T style={{ fontSize: 13, fontFamily: fonts.textMedium, color: colors.ink }}>{deviceKindLabel(device)}</T>
              {`  ${deviceSettingsSummary(device)}`}
            </T>
          ) : null}
          {changed ? (
            <Pressable
              accessibilityRole="button"
              disabled={!editable}
              onPress={() => t && patch((d) => fromLibrary(d, t))}
              testID={`${testID}-update`}
              style={{ paddingHorizontal: 2 }}
            >
              <T style={{ fontSize: 13, color: colors.caution, textDecorationLine: editable ? 'underline' : 'none' }}>
                {editable ? 'Library type changed since: use its current settings' : 'Library type changed since'}
              </T>
            </Pressable>
          ) : null}
        </View>
      );
    },
  },
];

export const COLUMNS: { [C in CollectionKey]: Column<ElementOf[C]>[] } = {
  buses: BUS_COLUMNS,
  sources: SOURCE_COLUMNS,
  transformers: TRANSFORMER_COLUMNS,
  cables: CABLE_COLUMNS,
  motors: MOTOR_COLUMNS,
  ties: TIE_COLUMNS,
  devices: DEVICE_COLUMNS,
};

/** A text for a field that does not apply in a table row. */
export function NotApplicable() {
  return (
    <View style={{ height: 38, justifyContent: 'center', paddingHorizontal: space.sm }}>
      <T style={{ color: colors.line, fontSize: 15 }}>—</T>
    </View>
  );
}

export type { GeneratorInput };
