/** Cards (phone). */
import { memo, useCallback } from 'react';
import { useUnitSystem } from '../../../hooks/unitSystem';
import { unitLabel } from '../../../hooks/units';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space } from '../../theme';
import { Button, T } from '../../ui';
import { COLUMNS, type Column } from '../columns';
import { FormField, Icon } from '../controls';
import { elementKey, elementSummary, fieldLabel, issueMessage, problemCount, type AnyElement } from '../summaries';
import { DeleteButton } from './DeleteButton';
import { ProblemBadge } from './ProblemBadge';
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
  const cardStyle = [
    styles.card,
    focused ? styles.cardFocused : bad ? styles.cardBad : null,
    bad ? styles.cardBarBad : focused ? styles.cardBarFocused : null,
  ];
  return (
    <View ref={ref} style={cardStyle} testID={`card-${base}`}>
      <Pressable
        accessibilityRole="button"
        aria-expanded={expanded}
        accessibilityLabel={`${element.id}, ${expanded ? 'collapse' : 'expand'}`}
        onPress={() => actions.toggle(key)}
        testID={`${base}-toggle`}
        style={({ pressed }) => [styles.toggle, pressed ? styles.togglePressed : null]}
      >
        <View style={styles.summary}>
          <T numberOfLines={1} style={styles.title}>
            <T style={styles.titleId}>{element.id || '(no id)'}</T>
            {element.name ? <T style={styles.titleName}>{`  ${element.name}`}</T> : null}
          </T>
          <T numberOfLines={expanded ? undefined : 1} style={styles.summaryText}>
            {elementSummary(collection, element, system)}
          </T>
          {bad && !expanded ? (
            <T numberOfLines={1} style={styles.summaryProblem}>
              {`${problemCount(issues.length)}: ${issues[0].field ? `${fieldLabel(issues[0].field)} — ` : ''}${issueMessage(issues[0].issue)}`}
            </T>
          ) : null}
        </View>
        {bad ? <ProblemBadge count={issues.length} /> : null}
        <Icon name={expanded ? 'chevron-down' : 'chevron-right'} size={20} color={colors.muted} />
      </Pressable>
      {expanded ? (
        <View style={styles.body}>
          {general.map((li, i) => (
            <T key={i} style={styles.problem}>
              {`${li.field ? `${fieldLabel(li.field)}: ` : ''}${issueMessage(li.issue)}`}
            </T>
          ))}
          <View style={styles.fields}>
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
                    <T variant="small" style={styles.fieldWarning} testID={`${base}-${c.key}-warning`}>
                      {`Worth checking: ${cautions.map((li) => li.issue.message).join(' · ')}`}
                    </T>
                  ) : null}
                </FormField>
              );
            })}
          </View>
          {editable ? (
            <View style={styles.actions}>
              <Button
                title="Duplicate"
                kind="secondary"
                onPress={() => actions.duplicate(collection, index)}
                testID={`${base}-duplicate`}
              />
              <DeleteButton onPress={() => actions.remove(collection, index)} testID={`${base}-delete`} />
            </View>
          ) : null}
        </View>
      ) : null}
    </View>
  );
});

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: colors.lineSoft,
    overflow: 'hidden',
  },
  cardFocused: { borderWidth: 2, borderColor: colors.accent },
  cardBad: { borderColor: '#E7B4B4' },
  /** The bar on the left: a problem outranks the focus. */
  cardBarBad: { borderLeftColor: colors.danger },
  cardBarFocused: { borderLeftColor: colors.accent },
  toggle: {
    minHeight: 56,
    paddingVertical: space.sm,
    paddingLeft: space.md,
    paddingRight: space.sm,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    backgroundColor: 'transparent',
  },
  togglePressed: { backgroundColor: colors.canvas },
  summary: { flex: 1, gap: 2, minWidth: 0 },
  title: { fontSize: 16 },
  titleId: { fontFamily: fonts.textBold, fontSize: 16 },
  titleName: { color: colors.muted, fontSize: 15 },
  summaryText: { fontSize: 14, lineHeight: 19, color: colors.inkSoft },
  summaryProblem: { fontSize: 14, lineHeight: 19, color: colors.danger },
  body: {
    paddingHorizontal: space.md,
    paddingBottom: space.md,
    paddingTop: space.xs,
    gap: space.md,
    borderTopWidth: 1,
    borderTopColor: colors.lineSoft,
  },
  problem: { color: colors.danger, fontSize: 15 },
  fields: { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.md, rowGap: space.md, paddingTop: space.sm },
  fieldWarning: { color: colors.caution },
  actions: { flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end', flexWrap: 'wrap' },
});
