/** Shared pieces of the element columns: the column and cell types and the building blocks every kind uses. */
import React from 'react';
import { StyleSheet, View } from 'react-native';
import type { DeviceType } from '../../../shared/schemas/deviceLibrary';
import { colors, space } from '../../theme';
import { T } from '../../ui';
import { NumCell, PickCell, TextCell, type PickOption, type Size } from '../controls';
import { withField } from '../edit';

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
  /** Devices section: opens the settings editor of this placed device (the element object of the model). */
  openDevice?: (device: object) => void;
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

export type Keyed<E> = { [K in keyof E]-?: E[K] extends number | undefined ? K : never }[keyof E];

export interface NumberExtra<E> extends Partial<Column<E>> {
  placeholder?: (e: E) => string | undefined;
  /** For fields not shared by every member of a union (generator kVA): read and write explicitly. */
  get?: (e: E) => number | undefined;
  set?: (e: E, v: number | undefined) => E;
}

export function numberColumn<E extends object>(
  key: Keyed<E> & string,
  label: string,
  unit: string | undefined,
  width: number,
  extra?: NumberExtra<E>,
): Column<E>;
export function numberColumn<E extends object>(
  key: string,
  label: string,
  unit: string | undefined,
  width: number,
  extra: NumberExtra<E> & Required<Pick<NumberExtra<E>, 'get' | 'set'>>,
): Column<E>;
export function numberColumn<E extends object>(
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

export function idColumn<E extends { id: string }>(width = 128): Column<E> {
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

export function nameColumn<E extends { name?: string }>(width = 180): Column<E> {
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
export function busColumn<E extends object>(
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

/** A text for a field that does not apply in a table row. */
export function NotApplicable() {
  return (
    <View style={styles.notApplicable}>
      <T style={styles.notApplicableText}>—</T>
    </View>
  );
}

const styles = StyleSheet.create({
  notApplicable: { height: 38, justifyContent: 'center', paddingHorizontal: space.sm },
  notApplicableText: { color: colors.line, fontSize: 15 },
});
