import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '../theme';
import { Button } from './Button';
import { T } from './Text';

/** A destructive action asked twice, in place: the first press shows the question and the two answers. */
export function ConfirmButton({
  title,
  question,
  confirmTitle,
  onConfirm,
  busy,
  testID,
}: {
  title: string;
  question: string;
  confirmTitle?: string;
  onConfirm: () => void;
  busy?: boolean;
  testID?: string;
}) {
  const [asking, setAsking] = useState(false);
  if (!asking)
    return <Button title={title} kind="secondary" busy={busy} testID={testID} onPress={() => setAsking(true)} />;
  return (
    <View style={styles.asking} testID={testID ? `${testID}-confirm` : undefined}>
      <T>{question}</T>
      <View style={styles.answers}>
        <Button
          title={confirmTitle ?? title}
          kind="danger"
          busy={busy}
          testID={testID ? `${testID}-yes` : undefined}
          onPress={() => {
            setAsking(false);
            onConfirm();
          }}
        />
        <Button
          title="Keep"
          kind="secondary"
          testID={testID ? `${testID}-no` : undefined}
          onPress={() => setAsking(false)}
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  asking: { gap: space.sm, flexShrink: 1 },
  answers: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
