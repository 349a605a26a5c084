/** Problems at the top. */
import { memo, useState } from 'react';
import { Pressable, View } from 'react-native';
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
    <View style={{ gap: space.sm }}>
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
    <View
      testID="model-warnings"
      style={{
        backgroundColor: colors.cautionSoft,
        borderLeftWidth: 4,
        borderLeftColor: colors.caution,
        borderRadius: radius.sm,
        paddingVertical: space.sm,
        paddingHorizontal: space.md,
        gap: 2,
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, paddingVertical: space.xs }}>
        <Icon name="alert" size={20} color={colors.caution} />
        <T variant="subheading" style={{ color: colors.caution }} testID="model-warnings-count">
          {`Worth checking: ${n} value${n === 1 ? '' : 's'}`}
        </T>
        <T variant="small" style={{ color: colors.caution, flexShrink: 1 }}>
          — allowed, but rarely right; they do not stop a run
        </T>
      </View>
      {shown.map((li, i) => (
        <Pressable
          key={i}
          accessibilityRole="link"
          onPress={() => onJump(li)}
          testID={`model-warning-${i}`}
          style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => ({
            minHeight: 40,
            justifyContent: 'center',
            paddingVertical: 4,
            paddingHorizontal: space.sm,
            marginHorizontal: -space.sm,
            borderRadius: radius.sm,
            backgroundColor: pressed || hovered ? 'rgba(122,75,0,0.08)' : 'transparent',
          })}
        >
          <T style={{ fontSize: 15, lineHeight: 21, color: colors.ink }}>
            <T style={{ fontFamily: fonts.textBold, fontSize: 15, color: colors.caution }}>{issuePlace(li, model)}</T>
            {`  ${li.issue.message}`}
          </T>
        </Pressable>
      ))}
      {n > SUMMARY_SHOWN ? (
        <Pressable
          accessibilityRole="button"
          onPress={() => setAll((v) => !v)}
          style={{ minHeight: 40, justifyContent: 'center' }}
          testID="model-warnings-more"
        >
          <T
            style={{
              color: colors.caution,
              fontFamily: fonts.textMedium,
              textDecorationLine: 'underline',
              fontSize: 15,
            }}
          >
            {all ? 'Show fewer' : `Show all ${n}`}
          </T>
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
      <View
        testID="model-issues-none"
        style={{
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          paddingHorizontal: space.md,
          paddingVertical: space.sm,
          backgroundColor: colors.okSoft,
          borderRadius: radius.sm,
        }}
      >
        <Icon name="check" size={18} color={colors.ok} />
        <T style={{ color: colors.ok, fontSize: 15 }}>No problems found in the model.</T>
      </View>
    );
  }
  const shown = all ? grouped.all : grouped.all.slice(0, SUMMARY_SHOWN);
  return (
    <View
      testID="model-issues"
      accessibilityRole="alert"
      style={{
        backgroundColor: colors.dangerSoft,
        borderLeftWidth: 4,
        borderLeftColor: colors.danger,
        borderRadius: radius.sm,
        paddingVertical: space.sm,
        paddingHorizontal: space.md,
        gap: 2,
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, paddingVertical: space.xs }}>
        <Icon name="alert" size={20} color={colors.danger} />
        <T variant="subheading" style={{ color: colors.danger }} testID="model-issues-count">
          {problemCount(n)}
        </T>
        <T variant="small" style={{ color: colors.danger, flexShrink: 1 }}>
          — tap one to go to it
        </T>
      </View>
      {shown.map((li, i) => (
        <Pressable
          key={i}
          accessibilityRole="link"
          onPress={() => onJump(li)}
          testID={`model-issue-${i}`}
          style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => ({
            minHeight: 40,
            justifyContent: 'center',
            paddingVertical: 4,
            paddingHorizontal: space.sm,
            marginHorizontal: -space.sm,
            borderRadius: radius.sm,
            backgroundColor: pressed || hovered ? 'rgba(155,28,28,0.08)' : 'transparent',
          })}
        >
          <T style={{ fontSize: 15, lineHeight: 21, color: colors.ink }}>
            <T style={{ fontFamily: fonts.textBold, fontSize: 15, color: colors.danger }}>{issuePlace(li, model)}</T>
            {`  ${issueMessage(li.issue)}`}
          </T>
        </Pressable>
      ))}
      {n > SUMMARY_SHOWN ? (
        <Pressable
          accessibilityRole="button"
          onPress={() => setAll((v) => !v)}
          style={{ minHeight: 40, justifyContent: 'center' }}
          testID="model-issues-more"
        >
          <T
            style={{
              color: colors.danger,
              fontFamily: fonts.textMedium,
              textDecorationLine: 'underline',
              fontSize: 15,
            }}
          >
            {all ? 'Show fewer' : `Show all ${n}`}
          </T>
        </Pressable>
      ) : null}
    </View>
  );
}
