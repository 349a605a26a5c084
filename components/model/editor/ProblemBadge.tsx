import { StyleSheet, View } from 'react-native';
import { colors, fonts } from '../../theme';
import { T } from '../../ui';

/** The red count of an element's or a scenario's problems in the editor; `label` is read out instead of the number. */
export function ProblemBadge({ count, label }: { count: number; label?: string }) {
  return (
    <View accessibilityLabel={label} style={styles.badge}>
      <T style={styles.text}>{count}</T>
    </View>
  );
}

const styles = StyleSheet.create({
  badge: {
    minWidth: 22,
    height: 22,
    borderRadius: 11,
    paddingHorizontal: 6,
    backgroundColor: colors.danger,
    alignItems: 'center',
    justifyContent: 'center',
  },
  text: { color: '#FFFFFF', fontFamily: fonts.numbersBold, fontSize: 12, lineHeight: 16 },
});
