/**
 * Long lists of the model editor (a collection's rows or cards, the system tree) drawn a window at a time: the first
 * `ROW_WINDOW` rows, then as many more at each press of "Show more". A 10 000-bus plant draws a hundred rows, not ten
 * thousand, so a phone scrolls it smoothly; the find box above narrows the list to any row at once, and a row the
 * editor jumps to (a problem, a new element) is always drawn.
 */
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radius, space, touch } from '../../theme';
import { T } from '../../ui';

/** Rows drawn at first, and added by each "Show more". */
export const ROW_WINDOW = 100;

/**
 * How many of `total` rows to draw: the window so far, and at least up to the row at position `mustShow` (-1: none).
 * The window starts again from `ROW_WINDOW` when `resetOn` changes (a new search).
 */
export function useRowWindow(total: number, resetOn: unknown, mustShow = -1): { shown: number; showMore: () => void } {
  const [limit, setLimit] = useState(ROW_WINDOW);
  const [seen, setSeen] = useState(resetOn);
  if (seen !== resetOn) {
    // Adjusting state while rendering (React's pattern for state derived from a prop): no extra frame drawn.
    setSeen(resetOn);
    setLimit(ROW_WINDOW);
  }
  const shown = Math.min(total, Math.max(limit, mustShow + 1));
  return { shown, showMore: () => setLimit(Math.max(limit, shown) + ROW_WINDOW) };
}

/** A count as the app writes large numbers (shared/numberFormat.ts): `2,001`. */
const count = (n: number) => n.toLocaleString('en-US');

/** "Showing 100 of 10,001 buses." and the button for the next window; nothing once every row is drawn. */
export function MoreRows({
  shown,
  total,
  noun,
  onMore,
  testID,
  canFind = true,
}: {
  shown: number;
  total: number;
  /** Plural, lower case: `buses`, `rows`. */
  noun: string;
  onMore: () => void;
  testID: string;
  /** A find box above narrows the list (it is named in the note). */
  canFind?: boolean;
}) {
  if (shown >= total) return null;
  const next = Math.min(ROW_WINDOW, total - shown);
  return (
    <View style={styles.more} testID={testID}>
      <T variant="small">{`Showing ${count(shown)} of ${count(total)} ${noun}.${canFind ? ' Find one by name, or show more.' : ''}`}</T>
      <Pressable
        accessibilityRole="button"
        onPress={onMore}
        testID={`${testID}-button`}
        style={({ pressed }) => [styles.button, pressed ? styles.buttonPressed : null]}
      >
        <T style={styles.buttonText}>{`Show ${count(next)} more`}</T>
      </Pressable>
    </View>
  );
}

const styles = StyleSheet.create({
  more: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    gap: space.sm,
    paddingVertical: space.sm,
  },
  button: {
    minHeight: touch.min,
    justifyContent: 'center',
    paddingHorizontal: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.accent,
    backgroundColor: colors.surface,
  },
  buttonPressed: { backgroundColor: colors.accentSoft },
  buttonText: { color: colors.accent, fontWeight: '600' },
});
