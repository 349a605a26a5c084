import { Link, useLocalSearchParams } from 'expo-router';
import React from 'react';
import { StyleSheet } from 'react-native';
import { attentionListSchema } from '../../../shared/schemas/attention';
import { AttentionListScreen } from '../../../components/screens/AttentionListScreen';
import { colors } from '../../../components/theme';
import { Notice, Screen } from '../../../components/ui';

export default function AttentionListRoute() {
  const { list } = useLocalSearchParams<{ list: string }>();
  const parsed = attentionListSchema.safeParse(list);
  if (!parsed.success) {
    return (
      <Screen title="No such list">
        <Notice tone="error">There is no list called “{String(list)}”.</Notice>
        <Link href="/attention" style={styles.link}>
          ← All lists
        </Link>
      </Screen>
    );
  }
  return <AttentionListScreen key={parsed.data} list={parsed.data} />;
}

const styles = StyleSheet.create({
  link: { color: colors.accent, fontSize: 16 },
});
