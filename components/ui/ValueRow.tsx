import React from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from '../theme';
import { T } from './Text';

/** A label on the left, its value on the right, with a hairline under it (result cards and traces). */
export function ValueRow({ label, children, testID }: { label: string; children: React.ReactNode; testID?: string }) {
  return (
    <View testID={testID} style={styles.row}>
      <T variant="small" style={styles.label}>
        {label}
      </T>
      <View style={styles.value}>{children}</View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    gap: space.md,
    paddingVertical: 6,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  label: { flexShrink: 1, color: colors.inkSoft },
  value: { alignItems: 'flex-end', flexShrink: 1 },
});
