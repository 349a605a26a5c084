import { useQuery } from '@tanstack/react-query';
import { Link } from 'expo-router';
import React from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { LABEL_STATUS_LABELS } from '../../shared/schemas/labels';
import { LABEL_STATUS_NOTICES } from '../../shared/labelDisplay';
import { groupLabelCode, parseLabelCode } from '../../shared/labelCode';
import { ApiClientError, callApi } from '../../hooks/api';
import { contract } from '../../shared/api';
import { queryKeys } from '../../hooks/queryKeys';
import { Cautions } from '../Cautions';
import { LabelView } from '../labels/LabelView';
import { colors, fonts, radius, space } from '../theme';
import { Notice, T } from '../ui';

const STATUS_STYLE = {
  current: { bg: colors.ok },
  superseded: { bg: colors.danger },
  'past-review': { bg: colors.caution },
} as const;

/** The public page a label's QR code opens: what the label says and whether it still holds. No sign-in. */
export function LabelCheckScreen({ code }: { code: string }) {
  const check = useQuery({
    queryKey: queryKeys.labels.check(code),
    queryFn: () => callApi(contract.labels.check, { params: { code: parseLabelCode(code) ?? code } }),
    retry: false,
  });
  const notFound = check.error instanceof ApiClientError && check.error.status === 404;
  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.pageContent}>
      <View style={styles.column}>
        <View style={styles.brand}>
          <View style={styles.mark} />
          <T style={styles.brandName}>Emberline label check</T>
        </View>
        {check.isLoading ? <T>Checking the label…</T> : null}
        {notFound ? (
          <View testID="label-not-found" style={styles.notFound}>
            <T variant="title">Label not found</T>
            <T>
              No label has the code {code}. Check the code printed under the QR code. If the label looks genuine, tell
              your supervisor: it may be damaged or not from this system.
            </T>
          </View>
        ) : null}
        {check.error && !notFound ? <Notice tone="error">{check.error.message}</Notice> : null}
        {check.data ? (
          <>
            <View
              testID="label-status"
              style={[styles.status, { backgroundColor: STATUS_STYLE[check.data.status].bg }]}
            >
              <T style={styles.statusWord}>{LABEL_STATUS_LABELS[check.data.status].toUpperCase()}</T>
              <T style={styles.statusNotice} testID="label-status-notice">
                {LABEL_STATUS_NOTICES[check.data.status]}
              </T>
              <T style={styles.statusDetail}>
                Checked {check.data.checkedAt.slice(0, 16).replace('T', ' ')} UTC · code{' '}
                {groupLabelCode(check.data.code)}
              </T>
            </View>
            {check.data.status === 'superseded' && check.data.current ? (
              <View style={styles.labelBlock} testID="label-current-values">
                <T variant="heading">The current label says</T>
                <LabelView content={check.data.current} />
              </View>
            ) : null}
            {check.data.status === 'superseded' && !check.data.current ? (
              <Notice tone="warning">
                No current label has been issued for this equipment yet: ask the engineer before working on it.
              </Notice>
            ) : null}
            <View style={styles.labelBlock}>
              <T variant="heading">
                {check.data.status === 'superseded' ? 'This (old) label says' : 'This label says'}
              </T>
              <LabelView content={check.data.content} code={check.data.code} />
            </View>
            {/* Labels are issued by approved studies only: never the "preliminary" wording of drafts here. */}
            <Cautions
              reviewed
              incidentEnergyCalPerCm2={(check.data.current ?? check.data.content).incidentEnergyCalPerCm2}
            />
            <Link href={`/labels/${check.data.code}`} style={styles.signInLink}>
              Electricians: sign in to mark this label installed or report what does not match
            </Link>
          </>
        ) : null}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.canvas },
  pageContent: { padding: space.lg, paddingBottom: 64 },
  column: { width: '100%', maxWidth: 560, alignSelf: 'center', gap: space.lg },
  brand: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  mark: { width: 10, height: 24, borderRadius: 5, backgroundColor: colors.accent },
  brandName: { fontFamily: fonts.textBold, fontSize: 18 },
  notFound: { gap: space.md },
  status: { borderRadius: radius.lg, padding: space.lg, gap: space.xs },
  statusWord: { color: '#fff', fontFamily: fonts.textBold, fontSize: 34, letterSpacing: 1 },
  statusNotice: { color: '#fff', fontSize: 17 },
  statusDetail: { color: '#fff', fontSize: 13, fontFamily: fonts.numbers },
  labelBlock: { gap: space.sm },
  signInLink: { color: colors.accent, fontSize: 16 },
});
