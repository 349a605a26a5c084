import { Link, useLocalSearchParams } from 'expo-router';
import React from 'react';
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
        <Link href="/attention" style={{ color: colors.accent, fontSize: 16 }}>
          ← All lists
        </Link>
      </Screen>
    );
  }
  return <AttentionListScreen key={parsed.data} list={parsed.data} />;
}
