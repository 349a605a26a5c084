import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { apiPath } from '../../hooks/api';
import { downloadFile } from '../../hooks/download';
import { serverErrors, useZodForm } from '../../hooks/forms';
import { parseNumberText } from '../../hooks/units';
import { contract } from '../../shared/api';
import { studyReportQuerySchema } from '../../shared/api/labelBatches';
import { FormNumberField } from '../form';
import { space } from '../theme';
import { Button, Notice, T } from '../ui';

/** The report's query with the appendix energy required (the form asks for the report with the appendix). */
const appendixSchema = studyReportQuerySchema.required();

/**
 * The study report with its mitigation appendix (engineers): every bus above the energy entered, with its best
 * options toward it (GET /studies/:id/report.pdf?mitigationAboveCalPerCm2=…).
 */
export function ReportAppendixForm({ studyId }: { studyId: string }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const form = useZodForm<typeof appendixSchema, { mitigationAboveCalPerCm2: string }>(appendixSchema, {
    defaultValues: { mitigationAboveCalPerCm2: '8' },
    toInput: (v) => ({ mitigationAboveCalPerCm2: parseNumberText(v.mitigationAboveCalPerCm2) }),
  });
  const submit = () =>
    void form.handleSubmit((q) => {
      setError(null);
      setBusy(true);
      const path = apiPath(contract.labelBatches.studyReportPdf, { params: { studyId }, query: q });
      void downloadFile(path, 'study-report-mitigation.pdf')
        .catch((e) => setError(serverErrors(e).message))
        .finally(() => setBusy(false));
    })();
  return (
    <View style={styles.box} testID="report-mitigation">
      <T variant="small">
        With a mitigation appendix: each bus above this energy with its best options to bring it there (computed for the
        report; it takes longer).
      </T>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <View style={styles.row}>
        <FormNumberField
          control={form.control}
          name="mitigationAboveCalPerCm2"
          label="Appendix for buses above"
          unit="cal/cm²"
          testID="report-mitigation-above"
          containerStyle={styles.field}
        />
        <Button
          title="Report with mitigation options (PDF)"
          kind="secondary"
          busy={busy}
          onPress={submit}
          testID="report-mitigation-download"
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end', gap: space.sm },
  field: { flexGrow: 1, flexBasis: 180 },
});
