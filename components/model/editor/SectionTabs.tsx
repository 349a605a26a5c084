/** Section selector. */
import { useEffect, useRef } from 'react';
import { Platform, Pressable, ScrollView, StyleSheet, View } from 'react-native';
import type { ModelInput } from '../../../shared/schemas/model';
import { colors, fonts, radius, space, touch } from '../../theme';
import { T } from '../../ui';
import { COLLECTION_LABELS, COLLECTIONS, groupIssues, itemsOf, problemCount } from '../summaries';
import { type Section } from './types';

const SECTIONS: Section[] = [...COLLECTIONS, 'scenarios', 'general'];

export function SectionTabs({
  section,
  onChange,
  model,
  grouped,
  wide,
}: {
  section: Section;
  onChange: (s: Section) => void;
  model: ModelInput;
  grouped: ReturnType<typeof groupIssues>;
  wide: boolean;
}) {
  // On a phone the tabs scroll sideways: keep the open one in view (e.g. after a jump to a problem).
  const refs = useRef(new Map<Section, View | null>());
  useEffect(() => {
    if (wide || Platform.OS !== 'web') return;
    const node = refs.current.get(section) as unknown as { scrollIntoView?: (o: object) => void } | null | undefined;
    node?.scrollIntoView?.({ inline: 'nearest', block: 'nearest' });
  }, [section, wide]);
  const tabs = SECTIONS.map((s) => {
    const count =
      s === 'general' ? undefined : s === 'scenarios' ? (model.scenarios ?? []).length : itemsOf(model, s).length;
    const problems = s === 'general' ? grouped.general.filter((g) => !g.collection).length : grouped.byCollection[s];
    const on = s === section;
    return (
      <Pressable
        key={s}
        ref={(node) => {
          refs.current.set(s, node);
        }}
        accessibilityRole="tab"
        aria-selected={on}
        onPress={() => onChange(s)}
        testID={`model-section-${s}`}
        style={({ hovered }: { pressed: boolean; hovered?: boolean }) => [
          styles.tab,
          on ? styles.tabOn : hovered ? styles.tabHovered : null,
        ]}
      >
        <T style={[styles.tabLabel, on ? styles.tabLabelOn : null]}>
          {s === 'general' ? 'General' : COLLECTION_LABELS[s].plural}
        </T>
        {count !== undefined ? <T style={[styles.tabCount, on ? styles.tabCountOn : null]}>{count}</T> : null}
        {problems ? (
          <View accessibilityLabel={problemCount(problems)} style={styles.problemBadge}>
            <T style={styles.problemBadgeText}>{problems}</T>
          </View>
        ) : null}
      </Pressable>
    );
  });
  if (wide) {
    return (
      <View accessibilityRole="tablist" style={styles.tabsWrap}>
        {tabs}
      </View>
    );
  }
  return (
    <ScrollView
      horizontal
      showsHorizontalScrollIndicator={false}
      accessibilityRole="tablist"
      contentContainerStyle={styles.tabsScrollContent}
      style={styles.tabsScroll}
    >
      {tabs}
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  tab: {
    minHeight: touch.min,
    paddingHorizontal: space.md,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    borderRadius: radius.sm,
    borderWidth: 1.5,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  tabOn: { borderColor: colors.accent, backgroundColor: colors.accentSoft },
  tabHovered: { backgroundColor: colors.canvas },
  tabLabel: { fontFamily: fonts.textMedium, fontSize: 15, color: colors.ink },
  tabLabelOn: { fontFamily: fonts.textBold },
  tabCount: { fontFamily: fonts.numbers, fontSize: 14, color: colors.muted },
  tabCountOn: { color: colors.accent },
  problemBadge: {
    minWidth: 20,
    height: 20,
    borderRadius: 10,
    paddingHorizontal: 5,
    backgroundColor: colors.danger,
    alignItems: 'center',
    justifyContent: 'center',
  },
  problemBadgeText: { color: '#FFFFFF', fontFamily: fonts.numbersBold, fontSize: 12, lineHeight: 16 },
  /** Wide: the tabs wrap; phone: they scroll sideways to the screen's edge. */
  tabsWrap: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  tabsScrollContent: { gap: space.sm, paddingRight: space.lg },
  tabsScroll: { marginRight: -space.lg },
});
