/** Cards (phone). */
import { memo, useCallback } from 'react';
import { useUnitSystem } from '../../../hooks/unitSystem';
import { unitLabel } from '../../../hooks/units';
import { Pressable, View, type ViewStyle } from 'react-native';
import { colors, fonts, radius, space, touch } from '../../theme';
import { Button, T } from '../../ui';
import { COLUMNS, type Column } from '../columns';
import { FormField, Icon } from '../controls';
import { elementKey, elementSummary, fieldLabel, issueMessage, problemCount, type AnyElement } from '../summaries';
import { useIssueColumns, useScrollIntoView } from './rowHooks';
import { NO_ISSUES, type RowProps } from './types';

export const CardRow = memo(function CardRow({
  collection,
  index,
  element,
  issues,
  warnings = NO_ISSUES,
  ctx,
  editable,
  focused,
  expanded,
  actions,
}: RowProps & { expanded: boolean }) {
  const columns = COLUMNS[collection] as Column<AnyElement>[];
  const { system } = useUnitSystem();
  const byColumn = useIssueColumns(issues, columns);
  const cautionByColumn = useIssueColumns(warnings, columns);
  const ref = useScrollIntoView(focused);
  const patch = useCallback(
    (u: (e: AnyElement) => AnyElement) => actions.patch(collection, index, u),
    [actions, collection, index],
  );
  const rename = useCallback((id: string) => actions.rename(collection, index, id), [actions, collection, index]);
  const key = elementKey(collection, index);
  const base = `${collection}-${index}`;
  const bad = issues.length > 0;
  const general = byColumn.get(-1) ?? [];
  const cardStyle: ViewStyle = {
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: focused ? 2 : 1,
    borderColor: focused ? colors.accent : bad ? '#E7B4B4' : colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: bad ? colors.danger : focused ? colors.accent : colors.lineSoft,
    overflow: 'hidden',
  };
  return (
    <View ref={ref} style={cardStyle} testID={`card-${base}`}>
      <Pressable
        accessibilityRole="button"
        aria-expanded={expanded}
        accessibilityLabel={`${element.id}, ${expanded ? 'collapse' : 'expand'}`}
        onPress={() => actions.toggle(key)}
        testID={`${base}-toggle`}
        style={({ pressed }) => ({
          minHeight: 56,
          paddingVertical: space.sm,
          paddingLeft: space.md,
          paddingRight: space.sm,
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          backgroundColor: pressed ? colors.canvas : 'transparent',
        })}
      >
        <View style={{ flex: 1, gap: 2, minWidth: 0 }}>
          <T numberOfLines={1} style={{ fontSize: 16 }}>
            <T style={{ fontFamily: fonts.textBold, fontSize: 16 }}>{element.id || '(no id)'}</T>
            {element.name ? <T style={{ color: colors.muted, fontSize: 15 }}>{`  ${element.name}`}</T> : null}
          </T>
          <T numberOfLines={expanded ? undefined : 1} style={{ fontSize: 14, lineHeight: 19, color: colors.inkSoft }}>
            {elementSummary(collection, element, system)}
          </T>
          {bad && !expanded ? (
            <T numberOfLines={1} style={{ fontSize: 14, lineHeight: 19, color: colors.danger }}>
              {`${problemCount(issues.length)}: ${issues[0].field ? `${fieldLabel(issues[0].field)} — ` : ''}${issueMessage(issues[0].issue)}`}
            </T>
          ) : null}
        </View>
        {bad ? (
          <View
            style={{
              minWidth: 22,
              height: 22,
              borderRadius: 11,
              paddingHorizontal: 6,
              backgroundColor: colors.danger,
              alignItems: 'center',
              justifyContent: 'center',
            }}
          >
            <T style={{ color: '#FFFFFF', fontFamily: fonts.numbersBold, fontSize: 12, lineHeight: 16 }}>
              {issues.length}
            </T>
          </View>
        ) : null}
        <Icon name={expanded ? 'chevron-down' : 'chevron-right'} size={20} color={colors.muted} />
      </Pressable>
      {expanded ? (
        <View
          style={{
            paddingHorizontal: space.md,
            paddingBottom: space.md,
            paddingTop: space.xs,
            gap: space.md,
            borderTopWidth: 1,
            borderTopColor: colors.lineSoft,
          }}
        >
          {general.map((li, i) => (
            <T key={i} style={{ color: colors.danger, fontSize: 15 }}>
              {`${li.field ? `${fieldLabel(li.field)}: ` : ''}${issueMessage(li.issue)}`}
            </T>
          ))}
          <View
            style={{
              flexDirection: 'row',
              flexWrap: 'wrap',
              columnGap: space.md,
              rowGap: space.md,
              paddingTop: space.sm,
            }}
          >
            {columns.map((c, ci) => {
              if (c.applies && !c.applies(element, ctx)) return null;
              const problems = byColumn.get(ci);
              const cautions = cautionByColumn.get(ci);
              return (
                <FormField
                  key={c.key}
                  label={c.formLabel ?? c.label}
                  unit={unitLabel(c.unit, system)}
                  basis={c.basis ?? 140}
                  error={problems ? problems.map((li) => issueMessage(li.issue)).join(' · ') : undefined}
                  hint={c.hint?.(element, ctx)}
                >
                  {c.render({
                    e: element,
                    size: 'form',
                    invalid: !!problems,
                    editable,
                    patch,
                    rename,
                    ctx,
                    testID: `${base}-${c.key}`,
                    label: `${element.id} ${c.label}`,
                  })}
                  {cautions && !problems ? (
                    <T variant="small" style={{ color: colors.caution }} testID={`${base}-${c.key}-warning`}>
                      {`Worth checking: ${cautions.map((li) => li.issue.message).join(' · ')}`}
                    </T>
                  ) : null}
                </FormField>
              );
            })}
          </View>
          {editable ? (
            <View style={{ flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end', flexWrap: 'wrap' }}>
              <Button
                title="Duplicate"
                kind="secondary"
                onPress={() => actions.duplicate(collection, index)}
                testID={`${base}-duplicate`}
              />
              <Pressable
                accessibilityRole="button"
                onPress={() => actions.remove(collection, index)}
                testID={`${base}-delete`}
                style={({ pressed }) => ({
                  minHeight: touch.min,
                  paddingHorizontal: space.lg,
                  borderRadius: radius.md,
                  borderWidth: 1,
                  borderColor: '#E7B4B4',
                  backgroundColor: pressed ? colors.dangerSoft : colors.surface,
                  flexDirection: 'row',
                  alignItems: 'center',
                  gap: space.sm,
                })}
              >
                <Icon name="trash" size={18} color={colors.danger} />
                <T style={{ color: colors.danger, fontFamily: fonts.textBold, fontSize: 16 }}>Delete</T>
              </Pressable>
            </View>
          ) : null}
        </View>
      ) : null}
    </View>
  );
});
