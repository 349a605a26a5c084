/** Table (wide). */
import { memo, useCallback } from 'react';
import { useUnitSystem } from '../../../hooks/unitSystem';
import { unitLabel } from '../../../hooks/units';
import { Platform, StyleSheet, View, type ViewStyle } from 'react-native';
import { colors, fonts, space } from '../../theme';
import { T } from '../../ui';
import { COLUMNS, NotApplicable, type Column } from '../columns';
import { Icon, IconButton } from '../controls';
import { COLLECTION_LABELS, fieldLabel, issueMessage, type AnyElement } from '../summaries';
import { useIssueColumns, useScrollIntoView } from './rowHooks';
import { NO_ISSUES, type RowProps } from './types';

const CELL_PAD = 4;
const STATUS_W = 40;
const ACTIONS_W = 86;
/** On the web, the id column and the row actions stay in view while the table scrolls sideways. */
const stickLeft = (Platform.OS === 'web' ? { position: 'sticky', left: 0, zIndex: 2 } : {}) as unknown as ViewStyle;
const stickRight = (Platform.OS === 'web' ? { position: 'sticky', right: 0, zIndex: 2 } : {}) as unknown as ViewStyle;

export const TableHeader = memo(function TableHeader({ columns }: { columns: Column<AnyElement>[] }) {
  const { system } = useUnitSystem();
  const [first, ...rest] = columns;
  const cell = (c: Column<AnyElement>) => (
    <View key={c.key} style={[styles.headCell, { width: c.width }]}>
      <T variant="label" numberOfLines={1}>
        {c.label}
        {c.unit ? <T variant="label" style={styles.headUnit}>{` ${unitLabel(c.unit, system)}`}</T> : null}
      </T>
    </View>
  );
  return (
    <View style={styles.head}>
      <View style={[styles.headStart, stickLeft]}>
        <View style={styles.headStatus} />
        {cell(first)}
      </View>
      {rest.map(cell)}
      <View style={styles.filler} />
      <View style={[styles.headActions, stickRight]} />
    </View>
  );
});

export const TableRow = memo(function TableRow({
  collection,
  index,
  element,
  issues,
  warnings = NO_ISSUES,
  ctx,
  editable,
  focused,
  actions,
}: RowProps) {
  const columns = COLUMNS[collection] as Column<AnyElement>[];
  const byColumn = useIssueColumns(issues, columns);
  const ref = useScrollIntoView(focused);
  const patch = useCallback(
    (u: (e: AnyElement) => AnyElement) => actions.patch(collection, index, u),
    [actions, collection, index],
  );
  const rename = useCallback((id: string) => actions.rename(collection, index, id), [actions, collection, index]);
  const bad = issues.length > 0;
  const base = `${collection}-${index}`;
  const rowBackground = focused ? styles.rowFocused : bad ? styles.rowBad : styles.rowPlain;
  const cell = (c: Column<AnyElement>, ci: number) => (
    <View key={c.key} style={[styles.cell, { width: c.width }]}>
      {!c.applies || c.applies(element, ctx) ? (
        c.render({
          e: element,
          size: 'cell',
          invalid: byColumn.has(ci),
          editable,
          patch,
          rename,
          ctx,
          testID: `${base}-${c.key}`,
          label: `${element.id || `${COLLECTION_LABELS[collection].singular} ${index + 1}`} ${c.label}`,
        })
      ) : (
        <NotApplicable />
      )}
    </View>
  );
  return (
    <View
      ref={ref}
      testID={`row-${base}`}
      style={[styles.row, rowBackground, focused ? styles.rowBarFocused : bad ? styles.rowBarBad : null]}
    >
      <View style={styles.rowLine}>
        <View style={[styles.rowStart, rowBackground, stickLeft]}>
          <View style={styles.rowStatus}>
            <T style={[styles.rowNumber, bad ? styles.rowNumberBad : null]}>{index + 1}</T>
          </View>
          {cell(columns[0], 0)}
        </View>
        <View style={styles.rowCells}>{columns.slice(1).map((c, i) => cell(c, i + 1))}</View>
        <View style={styles.filler} />
        <View style={[styles.rowActions, rowBackground, stickRight]}>
          {editable ? (
            <>
              <IconButton
                icon="copy"
                label={`Duplicate ${element.id}`}
                onPress={() => actions.duplicate(collection, index)}
                testID={`${base}-duplicate`}
                size={38}
              />
              <IconButton
                icon="trash"
                label={`Delete ${element.id}`}
                tone="danger"
                onPress={() => actions.remove(collection, index)}
                testID={`${base}-delete`}
                size={38}
              />
            </>
          ) : null}
        </View>
      </View>
      {bad ? (
        <View style={[styles.notes, stickLeft]} testID={`${base}-issues`}>
          {issues.map((li, i) => (
            <View key={i} style={styles.note}>
              <View style={styles.noteIcon}>
                <Icon name="alert" size={15} color={colors.danger} />
              </View>
              <T style={[styles.noteText, styles.danger]}>
                {li.field ? <T style={[styles.noteField, styles.danger]}>{`${fieldLabel(li.field)}: `}</T> : null}
                {issueMessage(li.issue)}
              </T>
            </View>
          ))}
        </View>
      ) : null}
      {warnings.length ? (
        <View style={[styles.notes, stickLeft]} testID={`${base}-warnings`}>
          {warnings.map((li, i) => (
            <View key={i} style={styles.note}>
              <View style={styles.noteIcon}>
                <Icon name="alert" size={15} color={colors.caution} />
              </View>
              <T style={[styles.noteText, styles.caution]}>
                <T style={[styles.noteField, styles.caution]}>
                  {`Worth checking${li.field ? ` · ${fieldLabel(li.field)}` : ''}: `}
                </T>
                {li.issue.message}
              </T>
            </View>
          ))}
        </View>
      ) : null}
    </View>
  );
});

const styles = StyleSheet.create({
  head: {
    flexDirection: 'row',
    alignItems: 'flex-end',
    backgroundColor: colors.canvas,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  headStart: { flexDirection: 'row', alignItems: 'flex-end', backgroundColor: colors.canvas },
  headStatus: { width: STATUS_W },
  /** A column's heading; its width is the column's. */
  headCell: { paddingHorizontal: CELL_PAD + 2, paddingVertical: space.sm },
  headUnit: { color: colors.muted, fontFamily: fonts.text },
  headActions: { width: ACTIONS_W, alignSelf: 'stretch', backgroundColor: colors.canvas },
  filler: { flex: 1 },
  row: { borderBottomWidth: 1, borderBottomColor: colors.lineSoft, borderLeftWidth: 3, borderLeftColor: 'transparent' },
  /** The row's background, also under its sticky id cell and actions. */
  rowPlain: { backgroundColor: colors.surface },
  rowFocused: { backgroundColor: colors.accentSoft },
  rowBad: { backgroundColor: '#FFF8F8' },
  rowBarFocused: { borderLeftColor: colors.accent },
  rowBarBad: { borderLeftColor: colors.danger },
  rowLine: { flexDirection: 'row', alignItems: 'flex-start' },
  rowStart: { flexDirection: 'row', alignItems: 'flex-start', alignSelf: 'stretch', paddingVertical: 6 },
  rowStatus: { width: STATUS_W - 3, height: 38, alignItems: 'center', justifyContent: 'center' },
  rowNumber: { fontFamily: fonts.numbers, fontSize: 13, color: colors.muted },
  rowNumberBad: { color: colors.danger },
  /** A cell; its width is the column's. */
  cell: { paddingHorizontal: CELL_PAD },
  rowCells: { flexDirection: 'row', alignItems: 'flex-start', paddingVertical: 6 },
  rowActions: {
    width: ACTIONS_W,
    alignSelf: 'stretch',
    flexDirection: 'row',
    justifyContent: 'flex-end',
    paddingTop: 6,
    paddingRight: 6,
    gap: 2,
  },
  /** The row's problems or warnings, under its cells. */
  notes: {
    paddingLeft: STATUS_W - 3 + CELL_PAD,
    paddingRight: space.md,
    paddingBottom: space.sm,
    gap: 2,
    alignSelf: 'flex-start',
    maxWidth: 900,
  },
  note: { flexDirection: 'row', alignItems: 'flex-start', gap: 6 },
  noteIcon: { marginTop: 2 },
  noteText: { fontSize: 14, lineHeight: 19, flexShrink: 1 },
  noteField: { fontFamily: fonts.textBold, fontSize: 14 },
  danger: { color: colors.danger },
  caution: { color: colors.caution },
});
