/** Problems at the top. */
import { memo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { ModelInput } from '../../../shared/schemas/model';
import { colors, fonts, radius, space } from '../../theme';
import { T } from '../../ui';
import { Icon } from '../controls';
import { groupIssues, issueMessage, issuePlace, problemCount, type LocatedIssue } from '../summaries';

const SUMMARY_SHOWN = 5;

/** The model's problems (blocking a run), then its plausibility warnings as "Worth checking" (never blocking). */
export const IssueSummary = memo(function IssueSummary({
  grouped,
  warnings,
  model,
  onJump,
}: {
  grouped: ReturnType<typeof groupIssues>;
  warnings?: ReturnType<typeof groupIssues>;
  model: ModelInput;
  onJump: (li: LocatedIssue) => void;
}) {
  return (
    <View style={styles.summary}>
      <Problems grouped={grouped} model={model} onJump={onJump} />
      {warnings && warnings.all.length > 0 ? <WorthChecking warnings={warnings} model={model} onJump={onJump} /> : null}
    </View>
  );
});

function WorthChecking({
  warnings,
  model,
  onJump,
}: {
  warnings: ReturnType<typeof groupIssues>;
  model: ModelInput;
  onJump: (li: LocatedIssue) => void;
}) {
  const [all, setAll] = useState(false);
  const n = warnings.all.length;
  const shown = all ? warnings.all : warnings.all.slice(0, SUMMARY_SHOWN);
  return (
    <View testID="model-warnings" style={[styles.box, styles.boxCaution]}>
      <View style={styles.head}>
        <Icon name="alert" size={20} color={colors.caution} />
        <T variant="subheading" style={styles.caution} testID="model-warnings-count">
          {`Worth checking: ${n} value${n === 1 ? '' : 's'}`}
        </T>
        <T variant="small" style={[styles.caution, styles.headNote]}>
          — allowed, but rarely right; they do not stop a run
        </T>
      </View>
      {shown.map((li, i) => (
        <Pressable
          key={i}
          accessibilityRole="link"
          onPress={() => onJump(li)}
          testID={`model-warning-${i}`}
          style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
            styles.item,
            pressed || hovered ? styles.itemCautionActive : null,
          ]}
        >
          <T style={styles.itemText}>
            <T style={[styles.itemPlace, styles.caution]}>{issuePlace(li, model)}</T>
            {`  ${li.issue.message}`}
          </T>
        </Pressable>
      ))}
      {n > SUMMARY_SHOWN ? (
        <Pressable
          accessibilityRole="button"
          onPress={() => setAll((v) => !v)}
          style={styles.more}
          testID="model-warnings-more"
        >
          <T style={[styles.moreText, styles.caution]}>{all ? 'Show fewer' : `Show all ${n}`}</T>
        </Pressable>
      ) : null}
    </View>
  );
}

function Problems({
  grouped,
  model,
  onJump,
}: {
  grouped: ReturnType<typeof groupIssues>;
  model: ModelInput;
  onJump: (li: LocatedIssue) => void;
}) {
  const [all, setAll] = useState(false);
  const n = grouped.all.length;
  if (n === 0) {
    return (
      <View testID="model-issues-none" style={styles.none}>
        <Icon name="check" size={18} color={colors.ok} />
        <T style={styles.noneText}>No problems found in the model.</T>
      </View>
    );
  }
  const shown = all ? grouped.all : grouped.all.slice(0, SUMMARY_SHOWN);
  return (
    <View testID="model-issues" accessibilityRole="alert" style={[styles.box, styles.boxDanger]}>
      <View style={styles.head}>
        <Icon name="alert" size={20} color={colors.danger} />
        <T variant="subheading" style={styles.danger} testID="model-issues-count">
          {problemCount(n)}
        </T>
        <T variant="small" style={[styles.danger, styles.headNote]}>
          — tap one to go to it
        </T>
      </View>
      {shown.map((li, i) => (
        <Pressable
          key={i}
          accessibilityRole="link"
          onPress={() => onJump(li)}
          testID={`model-issue-${i}`}
          style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
            styles.item,
            pressed || hovered ? styles.itemDangerActive : null,
          ]}
        >
          <T style={styles.itemText}>
            <T style={[styles.itemPlace, styles.danger]}>{issuePlace(li, model)}</T>
            {`  ${issueMessage(li.issue)}`}
          </T>
        </Pressable>
      ))}
      {n > SUMMARY_SHOWN ? (
        <Pressable
          accessibilityRole="button"
          onPress={() => setAll((v) => !v)}
          style={styles.more}
          testID="model-issues-more"
        >
          <T style={[styles.moreText, styles.danger]}>{all ? 'Show fewer' : `Show all ${n}`}</T>
        </Pressable>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  summary: { gap: space.sm },
  /** The problems' or the warnings' block: a bar on the left in its tone. */
  box: {
    borderLeftWidth: 4,
    borderRadius: radius.sm,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    gap: 2,
  },
  boxCaution: { backgroundColor: colors.cautionSoft, borderLeftColor: colors.caution },
  boxDanger: { backgroundColor: colors.dangerSoft, borderLeftColor: colors.danger },
  caution: { color: colors.caution },
  danger: { color: colors.danger },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm, paddingVertical: space.xs },
  headNote: { flexShrink: 1 },
  item: {
    minHeight: 40,
    justifyContent: 'center',
    paddingVertical: space.xs,
    paddingHorizontal: space.sm,
    marginHorizontal: -space.sm,
    borderRadius: radius.sm,
    backgroundColor: 'transparent',
  },
  /** Pressed or hovered: a tint of the block's tone. */
  itemCautionActive: { backgroundColor: 'rgba(122,75,0,0.08)' },
  itemDangerActive: { backgroundColor: 'rgba(155,28,28,0.08)' },
  itemText: { fontSize: 15, lineHeight: 21, color: colors.ink },
  itemPlace: { fontFamily: fonts.textBold, fontSize: 15 },
  more: { minHeight: 40, justifyContent: 'center' },
  moreText: { fontFamily: fonts.textMedium, textDecorationLine: 'underline', fontSize: 15 },
  none: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    backgroundColor: colors.okSoft,
    borderRadius: radius.sm,
  },
  noneText: { color: colors.ok, fontSize: 15 },
});
