/** Undo after a delete. */
import { Platform, Pressable, StyleSheet, View, type ViewStyle } from 'react-native';
import { useLayout } from '../../../hooks/useLayout';
import { colors, fonts, radius, space, touch } from '../../theme';
import { T } from '../../ui';
import { Icon, IconButton } from '../controls';

export function UndoToast({ text, onUndo, onDismiss }: { text: string; onUndo: () => void; onDismiss: () => void }) {
  const { wide } = useLayout();
  // Sticky to the bottom of the view while the editor is on screen (web); inline after the section elsewhere.
  const stick = (Platform.OS === 'web'
    ? { position: 'sticky', bottom: wide ? space.xl : space.md, zIndex: 5 }
    : {}) as unknown as ViewStyle;
  return (
    <View accessibilityRole="alert" testID="model-undo" style={[stick, styles.bar, wide ? styles.barWide : null]}>
      <T style={styles.text}>{text}</T>
      <Pressable accessibilityRole="button" onPress={onUndo} testID="model-undo-button" style={styles.undo}>
        <Icon name="undo" size={18} color="#9FE3E8" />
        <T style={styles.undoText}>Undo</T>
      </Pressable>
      <IconButton icon="close" label="Dismiss" onPress={onDismiss} color={colors.navMuted} />
    </View>
  );
}

const styles = StyleSheet.create({
  bar: {
    alignSelf: 'stretch',
    maxWidth: 560,
    backgroundColor: colors.ink,
    borderRadius: radius.md,
    paddingVertical: space.xs,
    paddingLeft: space.lg,
    paddingRight: space.xs,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    shadowColor: '#000',
    shadowOpacity: 0.25,
    shadowRadius: 12,
    shadowOffset: { width: 0, height: 4 },
  },
  barWide: { alignSelf: 'flex-end' },
  text: { color: colors.navInk, flex: 1, fontSize: 15 },
  undo: { minHeight: touch.min, paddingHorizontal: space.md, flexDirection: 'row', alignItems: 'center', gap: 6 },
  undoText: { color: '#9FE3E8', fontFamily: fonts.textBold },
});
