import React from 'react';
import { View } from 'react-native';
import { colors, space } from '../theme';
import { T } from './Text';

/** A label on the left, its value on the right, with a hairline under it (result cards and traces). */
export function ValueRow({ label, children, testID }: { label: string; children: React.ReactNode; testID?: string }) {
  return (
    <View
      testID={testID}
      style={{
        flexDirection: 'row',
        justifyContent: 'space-between',
        gap: space.md,
        paddingVertical: 6,
        borderBottomWidth: 1,
        borderBottomColor: colors.lineSoft,
      }}
    >
      <T variant="small" style={{ flexShrink: 1, color: colors.inkSoft }}>
        {label}
      </T>
      <View style={{ alignItems: 'flex-end', flexShrink: 1 }}>{children}</View>
    </View>
  );
}
