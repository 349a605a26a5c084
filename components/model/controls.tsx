/**
 * Compact inputs of the model editor. Each comes in two sizes: `cell` (a table cell on wide screens) and `form`
 * (a labelled field on a phone card, with large touch targets). Text and number inputs keep what is typed locally
 * and report upward, so a keystroke re-renders one row, not the editor.
 */
import React, { memo, useEffect, useMemo, useRef, useState } from 'react';
import { Modal, Platform, Pressable, ScrollView, StyleSheet, TextInput, View, type ViewStyle } from 'react-native';
import Svg, { Circle, Path, Rect } from 'react-native-svg';
import { useLayout } from '../../hooks/useLayout';
import { useUnitSystem } from '../../hooks/unitSystem';
import { lengthText, readLengthText, type StoredLength } from '../../hooks/units';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from '../ui';

export type Size = 'cell' | 'form';
const HEIGHT: Record<Size, number> = { cell: 38, form: touch.min };
/** Placeholders show typical values: lighter and in italics, so they never read as entered values. */
export const PLACEHOLDER = '#8C9AA6';

// ---------------------------------------------------------------------------------------------
// Icons (drawn here, 24-unit grid)

export type IconName =
  | 'plus'
  | 'copy'
  | 'trash'
  | 'chevron-down'
  | 'chevron-right'
  | 'check'
  | 'alert'
  | 'search'
  | 'close'
  | 'undo'
  | 'link';

export function Icon({ name, size = 18, color = colors.inkSoft }: { name: IconName; size?: number; color?: string }) {
  const stroke = {
    stroke: color,
    strokeWidth: 2,
    fill: 'none',
    strokeLinecap: 'round' as const,
    strokeLinejoin: 'round' as const,
  };
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24">
      {name === 'plus' ? <Path d="M12 5v14M5 12h14" {...stroke} /> : null}
      {name === 'copy' ? (
        <>
          <Rect x={8} y={8} width={12} height={12} rx={2} {...stroke} />
          <Path d="M16 8V5a1 1 0 0 0-1-1H5a1 1 0 0 0-1 1v10a1 1 0 0 0 1 1h3" {...stroke} />
        </>
      ) : null}
      {name === 'trash' ? <Path d="M4 7h16M10 11v6M14 11v6M6 7l1 13h10l1-13M9 7V4h6v3" {...stroke} /> : null}
      {name === 'chevron-down' ? <Path d="M6 9l6 6 6-6" {...stroke} /> : null}
      {name === 'chevron-right' ? <Path d="M9 6l6 6-6 6" {...stroke} /> : null}
      {name === 'check' ? <Path d="M5 12.5l4.5 4.5L19 7.5" {...stroke} /> : null}
      {name === 'alert' ? (
        <>
          <Circle cx={12} cy={12} r={9} {...stroke} />
          <Path d="M12 7.5v5.5M12 16.5v.01" {...stroke} />
        </>
      ) : null}
      {name === 'search' ? (
        <>
          <Circle cx={11} cy={11} r={6.5} {...stroke} />
          <Path d="M16 16l4 4" {...stroke} />
        </>
      ) : null}
      {name === 'close' ? <Path d="M6 6l12 12M18 6L6 18" {...stroke} /> : null}
      {name === 'undo' ? <Path d="M9 14L4 9l5-5M4 9h10a6 6 0 0 1 0 12h-3" {...stroke} /> : null}
      {name === 'link' ? (
        <Path
          d="M10 14a4 4 0 0 0 5.7 0l3-3a4 4 0 0 0-5.7-5.7l-1 1M14 10a4 4 0 0 0-5.7 0l-3 3a4 4 0 0 0 5.7 5.7l1-1"
          {...stroke}
        />
      ) : null}
    </Svg>
  );
}

export function IconButton({
  icon,
  label,
  onPress,
  tone = 'plain',
  size = 40,
  testID,
  disabled,
  color,
}: {
  icon: IconName;
  label: string;
  onPress: () => void;
  color?: string;
  tone?: 'plain' | 'danger';
  size?: number;
  testID?: string;
  disabled?: boolean;
}) {
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={label}
      onPress={onPress}
      disabled={disabled}
      testID={testID}
      {...(Platform.OS === 'web' ? ({ title: label } as object) : {})}
      style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
        styles.iconButton,
        { width: size, height: size },
        pressed || hovered ? (tone === 'danger' ? styles.iconButtonDangerActive : styles.iconButtonActive) : null,
        disabled ? styles.iconButtonDisabled : null,
      ]}
    >
      <Icon name={icon} color={color ?? (tone === 'danger' ? colors.danger : colors.inkSoft)} />
    </Pressable>
  );
}

// ---------------------------------------------------------------------------------------------
// Shared box style

function boxStyle(size: Size, invalid: boolean | undefined, editable: boolean) {
  return [
    styles.box,
    size === 'cell' ? styles.boxCell : styles.boxForm,
    invalid ? styles.boxInvalid : editable ? null : styles.boxReadOnly,
  ];
}

const heightOf = (size: Size) => (size === 'cell' ? styles.cellHeight : styles.formHeight);

// ---------------------------------------------------------------------------------------------
// Text and number inputs

const parseNum = (s: string): number | undefined => {
  const t = s.trim().replace(',', '.');
  if (t === '') return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : NaN;
};

interface InputCommon {
  size: Size;
  invalid?: boolean;
  editable: boolean;
  placeholder?: string;
  testID?: string;
  accessibilityLabel: string;
  style?: ViewStyle;
}

/**
 * Text input. `commit: 'change'` reports every keystroke; `commit: 'blur'` reports when the field is left or Enter
 * is pressed (ids: a rename moves references, so it happens once, on the final text).
 */
export const TextCell = memo(function TextCell({
  value,
  onChange,
  commit = 'change',
  mono,
  size,
  invalid,
  editable,
  placeholder,
  testID,
  accessibilityLabel,
  style,
}: InputCommon & {
  value: string | undefined;
  onChange: (v: string) => void;
  commit?: 'change' | 'blur';
  mono?: boolean;
}) {
  const [text, setText] = useState(value ?? '');
  const last = useRef(value ?? '');
  useEffect(() => {
    if ((value ?? '') !== last.current) {
      last.current = value ?? '';
      setText(value ?? '');
    }
  }, [value]);
  const flush = () => {
    if (text !== last.current) {
      last.current = text;
      onChange(text);
    }
  };
  return (
    <TextInput
      testID={testID}
      accessibilityLabel={accessibilityLabel}
      value={text}
      editable={editable}
      placeholder={placeholder}
      placeholderTextColor={PLACEHOLDER}
      onChangeText={(t) => {
        setText(t);
        if (commit === 'change') {
          last.current = t;
          onChange(t);
        }
      }}
      onBlur={commit === 'blur' ? flush : undefined}
      onSubmitEditing={commit === 'blur' ? flush : undefined}
      autoCapitalize="none"
      autoCorrect={false}
      style={[
        boxStyle(size, invalid, editable),
        styles.textInput,
        size === 'cell' ? styles.inputCell : null,
        mono ? styles.textInputMono : null,
        text === '' ? styles.inputEmpty : null,
        style as object,
      ]}
    />
  );
});

/**
 * A number input: keeps what is typed; reports a number, undefined when empty, NaN when not a number. A `length`
 * (stored in mm or m) is shown in the user's unit system (in or ft for US customary) and reported back in the stored
 * unit: exactly the converted number typed, and the stored value itself while the field is not edited, so showing
 * it or switching units never changes it.
 */
export const NumCell = memo(function NumCell({
  value,
  onChange,
  size,
  invalid,
  editable,
  placeholder,
  testID,
  accessibilityLabel,
  style,
  length,
  typical,
}: InputCommon & {
  value: number | undefined;
  onChange: (v: number | undefined) => void;
  length?: StoredLength;
  /** The typical value, in the stored unit, shown as the placeholder in the unit shown (a length only) */
  typical?: number | null;
}) {
  const { system } = useUnitSystem();
  if (length && typical != null) placeholder = lengthText(typical, length, system);
  const textOf = (v: number | undefined) =>
    length ? lengthText(v, length, system) : v === undefined || Number.isNaN(v) ? '' : String(v);
  const [text, setText] = useState(() => textOf(value));
  const last = useRef<number | undefined>(value);
  const shown = useRef({ text: textOf(value), value, system });
  useEffect(() => {
    if (!Object.is(value, last.current) || shown.current.system !== system) {
      last.current = value;
      const t = length
        ? lengthText(value, length, system)
        : value === undefined || Number.isNaN(value)
          ? ''
          : String(value);
      shown.current = { text: t, value, system };
      setText(t);
    }
  }, [value, system, length]);
  const parsed = parseNum(text);
  const bad = parsed !== undefined && Number.isNaN(parsed);
  return (
    <TextInput
      testID={testID}
      accessibilityLabel={accessibilityLabel}
      value={text}
      editable={editable}
      inputMode="decimal"
      placeholder={placeholder}
      placeholderTextColor={PLACEHOLDER}
      onChangeText={(t) => {
        setText(t);
        const v = length ? readLengthText(t, shown.current, length, system) : parseNum(t);
        last.current = v;
        onChange(v);
      }}
      style={[
        boxStyle(size, invalid || bad, editable),
        styles.numInput,
        size === 'cell' ? [styles.inputCell, styles.numInputCell] : null,
        text === '' ? [styles.inputEmpty, styles.numInputEmpty] : null,
        style as object,
      ]}
    />
  );
});

// ---------------------------------------------------------------------------------------------
// Segmented choice (two or three short options)

export function SegCell<V extends string>({
  value,
  options,
  onChange,
  size,
  invalid,
  editable,
  testID,
  accessibilityLabel,
  style,
}: {
  value: V | undefined;
  options: readonly { value: V; label: string }[];
  onChange: (v: V) => void;
  size: Size;
  invalid?: boolean;
  editable: boolean;
  testID?: string;
  accessibilityLabel: string;
  style?: ViewStyle;
}) {
  return (
    <View
      accessibilityRole="radiogroup"
      accessibilityLabel={accessibilityLabel}
      testID={testID}
      style={[styles.segments, heightOf(size), invalid ? styles.segmentsInvalid : null, style]}
    >
      {options.map((o, i) => {
        const on = o.value === value;
        return (
          <Pressable
            key={o.value}
            accessibilityRole="radio"
            aria-checked={on}
            aria-disabled={!editable}
            disabled={!editable}
            testID={testID ? `${testID}-${o.value}` : undefined}
            onPress={() => !on && onChange(o.value)}
            style={[
              styles.segment,
              size === 'cell' ? styles.segmentCell : null,
              on ? styles.segmentOn : null,
              i === 0 ? styles.segmentFirst : null,
            ]}
          >
            <T
              numberOfLines={1}
              style={[
                styles.segmentText,
                size === 'cell' ? styles.segmentTextCell : null,
                on ? styles.segmentTextOn : editable ? null : styles.segmentTextDisabled,
              ]}
            >
              {o.label}
            </T>
          </Pressable>
        );
      })}
    </View>
  );
}

/** A yes/no switch drawn as a checkbox with its label. */
export function CheckCell({
  value,
  onChange,
  label,
  size,
  editable,
  testID,
}: {
  value: boolean;
  onChange: (v: boolean) => void;
  label: string;
  size: Size;
  editable: boolean;
  testID?: string;
}) {
  return (
    <Pressable
      accessibilityRole="checkbox"
      aria-checked={value}
      aria-disabled={!editable}
      accessibilityLabel={label}
      disabled={!editable}
      testID={testID}
      onPress={() => onChange(!value)}
      style={[styles.check, heightOf(size)]}
    >
      <View style={[styles.checkBox, value ? styles.checkBoxOn : null]}>
        {value ? <Icon name="check" size={16} color={colors.accentInk} /> : null}
      </View>
      <T style={[styles.checkLabel, editable ? null : styles.checkLabelDisabled]}>{label}</T>
    </Pressable>
  );
}

// ---------------------------------------------------------------------------------------------
// Picker: a button that opens a searchable list (references, classes, library types)

export interface PickOption {
  value: string;
  label: string;
  /** Shorter text for the button in a table cell. */
  short?: string;
  detail?: string;
  group?: string;
}

export const PickCell = memo(function PickCell({
  value,
  options,
  onChange,
  title,
  placeholder = 'Choose…',
  emptyLabel,
  emptyShort,
  size,
  invalid,
  editable,
  testID,
  accessibilityLabel,
  style,
  unknownHint = 'not found',
  formatUnknown,
}: {
  value: string | undefined;
  options: readonly PickOption[];
  onChange: (v: string) => void;
  title: string;
  placeholder?: string;
  /** When given, an extra first option with value '' (e.g. "Typical of the class"). */
  emptyLabel?: string;
  /** The button's text for that option, when shorter than the sheet's (shown like a placeholder). */
  emptyShort?: string;
  size: Size;
  invalid?: boolean;
  editable: boolean;
  testID?: string;
  accessibilityLabel: string;
  style?: ViewStyle;
  unknownHint?: string;
  /** How to show a value that is not among the options (e.g. an unknown bus id). */
  formatUnknown?: (value: string) => string;
}) {
  const [open, setOpen] = useState(false);
  const selected = value === undefined || value === '' ? undefined : options.find((o) => o.value === value);
  const unknown = value !== undefined && value !== '' && !selected;
  const shown = selected
    ? size === 'cell' && selected.short
      ? selected.short
      : selected.label
    : unknown
      ? formatUnknown
        ? formatUnknown(value)
        : value
      : (emptyShort ?? emptyLabel ?? placeholder);
  const dim = !selected && !unknown;
  return (
    <>
      <Pressable
        accessibilityRole="button"
        accessibilityLabel={`${accessibilityLabel}: ${shown}`}
        aria-disabled={!editable}
        aria-expanded={open}
        disabled={!editable}
        testID={testID}
        onPress={() => setOpen(true)}
        style={[boxStyle(size, invalid || unknown, editable), styles.pick, style]}
      >
        <T
          numberOfLines={1}
          style={[
            styles.pickText,
            size === 'cell' ? styles.pickTextCell : null,
            dim ? styles.pickTextDim : null,
            unknown ? styles.pickTextUnknown : null,
          ]}
        >
          {shown}
          {unknown && size === 'form' ? <T style={styles.pickHint}>{`  ${unknownHint}`}</T> : null}
        </T>
        {editable ? <Icon name="chevron-down" size={16} color={colors.muted} /> : null}
      </Pressable>
      {open ? (
        <PickSheet
          title={title}
          value={value}
          options={options}
          emptyLabel={emptyLabel}
          onClose={() => setOpen(false)}
          onPick={(v) => {
            setOpen(false);
            if (v !== (value ?? '')) onChange(v);
          }}
          testID={testID ? `${testID}-sheet` : undefined}
        />
      ) : null}
    </>
  );
});

function PickSheet({
  title,
  value,
  options,
  emptyLabel,
  onPick,
  onClose,
  testID,
}: {
  title: string;
  value: string | undefined;
  options: readonly PickOption[];
  emptyLabel?: string;
  onPick: (v: string) => void;
  onClose: () => void;
  testID?: string;
}) {
  const { wide, width } = useLayout();
  const [query, setQuery] = useState('');
  const searchable = options.length > 8;
  const rows = useMemo(() => {
    const q = query.trim().toLowerCase();
    const list = q
      ? options.filter((o) => `${o.label} ${o.detail ?? ''} ${o.group ?? ''}`.toLowerCase().includes(q))
      : options;
    const out: ({ type: 'group'; label: string } | { type: 'option'; option: PickOption })[] = [];
    let group: string | undefined;
    for (const o of list) {
      if (o.group && o.group !== group) out.push({ type: 'group', label: o.group });
      group = o.group;
      out.push({ type: 'option', option: o });
    }
    return out;
  }, [options, query]);
  return (
    <Modal transparent visible animationType="fade" onRequestClose={onClose}>
      <View style={[styles.sheetFrame, wide ? styles.sheetFrameWide : null]}>
        <Pressable accessibilityLabel="Close" onPress={onClose} style={styles.sheetBackdrop} />
        <View
          testID={testID}
          accessibilityViewIsModal
          style={[styles.sheet, wide ? [styles.sheetWide, { width: Math.min(520, width - 64) }] : null]}
        >
          <View style={styles.sheetHead}>
            <T variant="heading" style={styles.sheetTitle}>
              {title}
            </T>
            <IconButton icon="close" label="Close" onPress={onClose} size={touch.min} />
          </View>
          {searchable ? (
            <View style={styles.sheetSearch}>
              <View style={[boxStyle('form', false, true), styles.searchBox]}>
                <Icon name="search" size={18} color={colors.muted} />
                <TextInput
                  value={query}
                  onChangeText={setQuery}
                  placeholder="Search"
                  placeholderTextColor={colors.muted}
                  autoFocus={wide}
                  autoCapitalize="none"
                  autoCorrect={false}
                  testID={testID ? `${testID}-search` : undefined}
                  style={styles.searchInput}
                />
              </View>
            </View>
          ) : null}
          <ScrollView
            style={styles.sheetList}
            contentContainerStyle={styles.sheetListContent}
            keyboardShouldPersistTaps="handled"
          >
            {emptyLabel !== undefined && !query ? (
              <OptionRow
                label={emptyLabel}
                selected={!value}
                onPress={() => onPick('')}
                testID={testID ? `${testID}-opt-` : undefined}
              />
            ) : null}
            {rows.map((r, i) =>
              r.type === 'group' ? (
                <T key={`g${i}`} variant="label" style={styles.group}>
                  {r.label}
                </T>
              ) : (
                <OptionRow
                  key={`o${r.option.value}`}
                  label={r.option.label}
                  detail={r.option.detail}
                  selected={r.option.value === value}
                  onPress={() => onPick(r.option.value)}
                  testID={testID ? `${testID}-opt-${r.option.value}` : undefined}
                />
              ),
            )}
            {rows.length === 0 ? (
              <T variant="small" style={styles.noOptions}>
                {options.length === 0 ? 'Nothing to choose from yet.' : 'No match.'}
              </T>
            ) : null}
          </ScrollView>
        </View>
      </View>
    </Modal>
  );
}

function OptionRow({
  label,
  detail,
  selected,
  onPress,
  testID,
}: {
  label: string;
  detail?: string;
  selected: boolean;
  onPress: () => void;
  testID?: string;
}) {
  return (
    <Pressable
      accessibilityRole="button"
      aria-pressed={selected}
      onPress={onPress}
      testID={testID}
      style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
        styles.option,
        selected ? styles.optionSelected : pressed || hovered ? styles.optionHovered : null,
      ]}
    >
      <View style={styles.optionText}>
        <T style={[styles.optionLabel, selected ? styles.optionLabelSelected : null]}>{label}</T>
        {detail ? (
          <T variant="small" numberOfLines={2}>
            {detail}
          </T>
        ) : null}
      </View>
      {selected ? <Icon name="check" size={18} color={colors.accent} /> : null}
    </Pressable>
  );
}

// ---------------------------------------------------------------------------------------------
// Form wrapper (phone cards): label, unit, the control, and the message of the issue on that field

export function FormField({
  label,
  unit,
  error,
  hint,
  basis = 150,
  children,
}: {
  label: string;
  unit?: string;
  error?: string;
  hint?: string;
  basis?: number;
  children: React.ReactNode;
}) {
  return (
    <View style={[styles.formField, { flexBasis: basis }]}>
      <T variant="label">
        {label}
        {unit ? <T variant="label" style={styles.formUnit}>{` (${unit})`}</T> : null}
      </T>
      {children}
      {error ? (
        <T variant="small" style={styles.formError} accessibilityRole="alert">
          {error}
        </T>
      ) : hint ? (
        <T variant="small">{hint}</T>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  /** The box of an input or a picker button: smaller in a table cell; red when invalid; grey when read-only. */
  box: { borderRadius: radius.sm, borderColor: colors.line, backgroundColor: colors.surface },
  boxCell: { height: HEIGHT.cell, borderWidth: 1, paddingHorizontal: space.sm },
  boxForm: { height: HEIGHT.form, borderWidth: 1.5, paddingHorizontal: space.md },
  boxInvalid: { borderColor: colors.danger, backgroundColor: '#FFF8F8' },
  boxReadOnly: { borderColor: colors.lineSoft, backgroundColor: colors.canvas },
  cellHeight: { height: HEIGHT.cell },
  formHeight: { height: HEIGHT.form },
  iconButton: {
    borderRadius: radius.sm,
    alignItems: 'center',
    justifyContent: 'center',
    backgroundColor: 'transparent',
    opacity: 1,
  },
  /** Pressed or hovered. */
  iconButtonActive: { backgroundColor: colors.lineSoft },
  iconButtonDangerActive: { backgroundColor: colors.dangerSoft },
  iconButtonDisabled: { opacity: 0.4 },
  /** The typed text of a text or number input (the box is boxStyle). */
  textInput: { color: colors.ink, fontFamily: fonts.text, fontSize: 16, minWidth: 0, fontStyle: 'normal' },
  textInputMono: { fontFamily: fonts.textMedium },
  numInput: {
    color: colors.ink,
    fontFamily: fonts.numbers,
    fontStyle: 'normal',
    fontSize: 16,
    textAlign: 'left',
    minWidth: 0,
  },
  /** In a table cell: a little smaller; numbers right-aligned. */
  inputCell: { fontSize: 15 },
  numInputCell: { textAlign: 'right' },
  /** Empty: the placeholder in italics (and in the text face for a number). */
  inputEmpty: { fontStyle: 'italic' },
  numInputEmpty: { fontFamily: fonts.text },
  segments: {
    flexDirection: 'row',
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radius.sm,
    overflow: 'hidden',
    backgroundColor: colors.surface,
  },
  segmentsInvalid: { borderColor: colors.danger },
  segment: {
    flex: 1,
    alignItems: 'center',
    justifyContent: 'center',
    paddingHorizontal: space.sm,
    backgroundColor: 'transparent',
    borderLeftWidth: 1,
    borderLeftColor: colors.line,
  },
  segmentCell: { paddingHorizontal: space.xs },
  segmentOn: { backgroundColor: colors.accentSoft },
  segmentFirst: { borderLeftWidth: 0 },
  segmentText: { fontSize: 15, fontFamily: fonts.text, color: colors.inkSoft },
  segmentTextCell: { fontSize: 14 },
  segmentTextOn: { fontFamily: fonts.textBold, color: colors.accent },
  segmentTextDisabled: { color: colors.muted },
  check: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  checkBox: {
    width: 22,
    height: 22,
    borderRadius: 5,
    borderWidth: 1.5,
    borderColor: colors.line,
    backgroundColor: colors.surface,
    alignItems: 'center',
    justifyContent: 'center',
  },
  checkBoxOn: { borderColor: colors.accent, backgroundColor: colors.accent },
  checkLabel: { fontSize: 15, color: colors.ink },
  checkLabelDisabled: { color: colors.muted },
  pick: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  pickText: { flex: 1, fontSize: 16, color: colors.ink, fontStyle: 'normal' },
  pickTextCell: { fontSize: 15 },
  /** Nothing chosen: the placeholder. */
  pickTextDim: { color: PLACEHOLDER, fontStyle: 'italic' },
  /** A value not among the options. */
  pickTextUnknown: { color: colors.danger },
  pickHint: { fontSize: 13, color: colors.danger },
  /** The picker's sheet: from the bottom on a phone, a centred dialog on a wide screen. */
  sheetFrame: { flex: 1, justifyContent: 'flex-end', alignItems: 'center' },
  sheetFrameWide: { justifyContent: 'center' },
  sheetBackdrop: { position: 'absolute', top: 0, left: 0, right: 0, bottom: 0, backgroundColor: 'rgba(14,34,48,0.45)' },
  sheet: {
    width: '100%',
    maxHeight: '85%',
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderBottomLeftRadius: 0,
    borderBottomRightRadius: 0,
    paddingTop: space.lg,
    paddingBottom: space.xl,
    gap: space.sm,
  },
  sheetWide: {
    maxHeight: '75%',
    borderBottomLeftRadius: radius.lg,
    borderBottomRightRadius: radius.lg,
    paddingBottom: space.md,
  },
  sheetHead: { flexDirection: 'row', alignItems: 'center', paddingHorizontal: space.lg, gap: space.sm },
  sheetTitle: { flex: 1, fontSize: 18 },
  sheetSearch: { paddingHorizontal: space.lg },
  searchBox: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  searchInput: { flex: 1, height: '100%', fontSize: 16, fontFamily: fonts.text, color: colors.ink, minWidth: 0 },
  sheetList: { flexGrow: 0 },
  sheetListContent: { paddingHorizontal: space.sm },
  group: {
    paddingHorizontal: space.md,
    paddingTop: space.md,
    paddingBottom: space.xs,
    textTransform: 'uppercase',
    color: colors.muted,
  },
  noOptions: { padding: space.md },
  option: {
    minHeight: touch.min,
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    borderRadius: radius.sm,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    backgroundColor: 'transparent',
  },
  optionSelected: { backgroundColor: colors.accentSoft },
  optionHovered: { backgroundColor: colors.canvas },
  optionText: { flex: 1, gap: 1 },
  optionLabel: { fontFamily: fonts.textMedium, fontSize: 16 },
  optionLabelSelected: { fontFamily: fonts.textBold },
  /** A field of a phone card; its basis is the column's. */
  formField: { flexGrow: 1, minWidth: 0, gap: space.xs },
  formUnit: { color: colors.muted, fontFamily: fonts.text },
  formError: { color: colors.danger },
});
