/**
 * A table that scrolls sideways and says so: when its columns are wider than the screen, a line above it tells how
 * much is out of view and offers buttons to scroll, and the edge where columns are hidden is shaded. Without it a
 * wide screen hid columns behind a scroll bar that shows only on hover.
 */
import React, { useRef, useState } from 'react';
import {
  type NativeScrollEvent,
  type NativeSyntheticEvent,
  Pressable,
  ScrollView,
  StyleSheet,
  View,
} from 'react-native';
import { colors, fonts, radius, space } from '../../theme';
import { T } from '../../ui';

export function SideScroll({ children, testID }: { children: React.ReactNode; testID?: string }) {
  const ref = useRef<ScrollView>(null);
  const [box, setBox] = useState(0);
  const [content, setContent] = useState(0);
  const [x, setX] = useState(0);
  const hiddenRight = Math.max(0, content - box - x);
  const hiddenLeft = Math.max(0, x);
  const overflow = content > box + 1 && box > 0;
  const step = Math.max(200, box * 0.6);
  const onScroll = (e: NativeSyntheticEvent<NativeScrollEvent>) => setX(e.nativeEvent.contentOffset.x);
  const button = (label: string, dx: number, enabled: boolean, id: string) => (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={label}
      disabled={!enabled}
      testID={testID ? `${testID}-${id}` : undefined}
      onPress={() => ref.current?.scrollTo({ x: Math.max(0, x + dx), animated: true })}
      style={({ hovered }: { hovered?: boolean }) => [
        styles.arrow,
        hovered && enabled ? styles.arrowHovered : null,
        enabled ? null : styles.arrowDisabled,
      ]}
    >
      <T style={styles.arrowText}>{label}</T>
    </Pressable>
  );
  return (
    <View>
      {overflow ? (
        <View testID={testID ? `${testID}-hint` : undefined} style={styles.hint}>
          <T variant="small" style={styles.hintText}>
            {hiddenRight > 1
              ? 'More columns to the right: scroll sideways (shift + wheel) or use the arrows.'
              : 'Columns on the left are scrolled out of view.'}
          </T>
          {button('← Left', -step, hiddenLeft > 1, 'left')}
          {button('Right →', step, hiddenRight > 1, 'right')}
        </View>
      ) : null}
      <View onLayout={(e) => setBox(e.nativeEvent.layout.width)}>
        <ScrollView
          ref={ref}
          horizontal
          contentContainerStyle={styles.scrollContent}
          onContentSizeChange={(w) => setContent(w)}
          onScroll={onScroll}
          scrollEventThrottle={32}
        >
          {children}
        </ScrollView>
        {overflow && hiddenRight > 1 ? (
          <View
            pointerEvents="none"
            style={
              {
                position: 'absolute',
                top: 0,
                bottom: 0,
                right: 0,
                width: 24,
                // A shade on the edge where columns are hidden.
                backgroundImage: `linear-gradient(to right, rgba(0,0,0,0), rgba(15,35,50,0.12))`,
              } as object
            }
          />
        ) : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  /** "← Left" and "Right →". */
  arrow: {
    paddingHorizontal: space.sm,
    paddingVertical: 2,
    borderRadius: radius.sm,
    backgroundColor: 'transparent',
    opacity: 1,
  },
  arrowHovered: { backgroundColor: colors.lineSoft },
  arrowDisabled: { opacity: 0.35 },
  arrowText: { color: colors.accent, fontFamily: fonts.textMedium, fontSize: 14 },
  hint: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    borderBottomWidth: 1,
    borderColor: colors.lineSoft,
    backgroundColor: colors.canvas,
  },
  hintText: { flex: 1 },
  scrollContent: { flexGrow: 1 },
});
