import { Pressable, StyleSheet } from 'react-native';
import { colors, fonts, radius, space, touch } from '../../theme';
import { T } from '../../ui';
import { Icon } from '../controls';

/** The editor's "Delete" button of an element or a scenario (undo brings it back). */
export function DeleteButton({ onPress, testID }: { onPress: () => void; testID: string }) {
  return (
    <Pressable
      accessibilityRole="button"
      onPress={onPress}
      testID={testID}
      style={({ pressed }) => [styles.delete, pressed ? styles.deletePressed : null]}
    >
      <Icon name="trash" size={18} color={colors.danger} />
      <T style={styles.deleteText}>Delete</T>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  delete: {
    minHeight: touch.min,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: '#E7B4B4',
    backgroundColor: colors.surface,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
  },
  deletePressed: { backgroundColor: colors.dangerSoft },
  deleteText: { color: colors.danger, fontFamily: fonts.textBold, fontSize: 16 },
});
