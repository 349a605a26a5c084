/** Table (wide). */
import { memo, useCallback } from 'react';
import { useUnitSystem } from '../../../hooks/unitSystem';
import { unitLabel } from '../../../hooks/units';
import { Platform, View, type ViewStyle } from 'react-native';
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
    <View key={c.key} style={{ width: c.width, paddingHorizontal: CELL_PAD + 2, paddingVertical: space.sm }}>
      <T variant="label" numberOfLines={1}>
        {c.label}
        {c.unit ? (
          <T
            variant="label"
            style={{ color: colors.muted, fontFamily: fonts.text }}
          >{` ${unitLabel(c.unit, system)}`}</T>
        ) : null}
      </T>
    </View>
  );
  return (
    <View
      style={{
        flexDirection: 'row',
        alignItems: 'flex-end',
        backgroundColor: colors.canvas,
        borderBottomWidth: 1,
        borderBottomColor: colors.line,
      }}
    >
      <View style={[{ flexDirection: 'row', alignItems: 'flex-end', backgroundColor: colors.canvas }, stickLeft]}>
        <View style={{ width: STATUS_W }} />
        {cell(first)}
      </View>
      {rest.map(cell)}
      <View style={{ flex: 1 }} />
      <View style={[{ width: ACTIONS_W, alignSelf: 'stretch', backgroundColor: colors.canvas }, stickRight]} />
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
  const rowBg = focused ? colors.accentSoft : bad ? '#FFF8F8' : colors.surface;
  const cell = (c: Column<AnyElement>, ci: number) => (
    <View key={c.key} style={{ width: c.width, paddingHorizontal: CELL_PAD }}>
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
      style={{
        borderBottomWidth: 1,
        borderBottomColor: colors.lineSoft,
        backgroundColor: rowBg,
        borderLeftWidth: 3,
        borderLeftColor: focused ? colors.accent : bad ? colors.danger : 'transparent',
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'flex-start' }}>
        <View
          style={[
            {
              flexDirection: 'row',
              alignItems: 'flex-start',
              backgroundColor: rowBg,
              alignSelf: 'stretch',
              paddingVertical: 6,
            },
            stickLeft,
          ]}
        >
          <View style={{ width: STATUS_W - 3, height: 38, alignItems: 'center', justifyContent: 'center' }}>
            <T style={{ fontFamily: fonts.numbers, fontSize: 13, color: bad ? colors.danger : colors.muted }}>
              {index + 1}
            </T>
          </View>
          {cell(columns[0], 0)}
        </View>
        <View style={{ flexDirection: 'row', alignItems: 'flex-start', paddingVertical: 6 }}>
          {columns.slice(1).map((c, i) => cell(c, i + 1))}
        </View>
        <View style={{ flex: 1 }} />
        <View
          style={[
            {
              width: ACTIONS_W,
              alignSelf: 'stretch',
              flexDirection: 'row',
              justifyContent: 'flex-end',
              paddingTop: 6,
              paddingRight: 6,
              gap: 2,
              backgroundColor: rowBg,
            },
            stickRight,
          ]}
        >
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
        <View
          style={[
            {
              paddingLeft: STATUS_W - 3 + CELL_PAD,
              paddingRight: space.md,
              paddingBottom: space.sm,
              gap: 2,
              alignSelf: 'flex-start',
              maxWidth: 900,
            },
            stickLeft,
          ]}
          testID={`${base}-issues`}
        >
          {issues.map((li, i) => (
            <View key={i} style={{ flexDirection: 'row', alignItems: 'flex-start', gap: 6 }}>
              <View style={{ marginTop: 2 }}>
                <Icon name="alert" size={15} color={colors.danger} />
              </View>
              <T style={{ fontSize: 14, lineHeight: 19, color: colors.danger, flexShrink: 1 }}>
                {li.field ? (
                  <T
                    style={{ fontFamily: fonts.textBold, fontSize: 14, color: colors.danger }}
                  >{`${fieldLabel(li.field)}: `}</T>
                ) : null}
                {issueMessage(li.issue)}
              </T>
            </View>
          ))}
        </View>
      ) : null}
      {warnings.length ? (
        <View
          style={[
            {
              paddingLeft: STATUS_W - 3 + CELL_PAD,
              paddingRight: space.md,
              paddingBottom: space.sm,
              gap: 2,
              alignSelf: 'flex-start',
              maxWidth: 900,
            },
            stickLeft,
          ]}
          testID={`${base}-warnings`}
        >
          {warnings.map((li, i) => (
            <View key={i} style={{ flexDirection: 'row', alignItems: 'flex-start', gap: 6 }}>
              <View style={{ marginTop: 2 }}>
                <Icon name="alert" size={15} color={colors.caution} />
              </View>
              <T style={{ fontSize: 14, lineHeight: 19, color: colors.caution, flexShrink: 1 }}>
                <T style={{ fontFamily: fonts.textBold, fontSize: 14, color: colors.caution }}>
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
