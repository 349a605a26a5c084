/** General (the study as a whole). */
import { StyleSheet, View } from 'react-native';
import type { ModelInput } from '../../../shared/schemas/model';
import { colors, space } from '../../theme';
import { Card, Choice, T } from '../../ui';
import { FormField, NumCell, TextCell } from '../controls';
import { withField } from '../edit';
import { fieldLabel, groupIssues, issueMessage } from '../summaries';
import { SECTION_NOTES } from './types';

export function GeneralSection({
  model,
  commit,
  editable,
  grouped,
}: {
  model: ModelInput;
  commit: (m: ModelInput) => void;
  editable: boolean;
  grouped: ReturnType<typeof groupIssues>;
}) {
  const errorOf = (field: string) => {
    const li = grouped.general.find((g) => !g.collection && g.field === field);
    return li ? issueMessage(li.issue) : undefined;
  };
  const others = grouped.general.filter(
    (g) => !g.collection && !['name', 'frequencyHz', 'prefaultPu'].includes(g.field ?? ''),
  );
  return (
    <Card testID="model-general">
      <T variant="small">{SECTION_NOTES.general}</T>
      {others.map((li, i) => (
        <T key={i} style={styles.problem}>
          {`${fieldLabel(li.field) || 'Model'}: ${issueMessage(li.issue)}`}
        </T>
      ))}
      <View style={styles.fields}>
        <FormField label="Study name" error={errorOf('name')} basis={260}>
          <TextCell
            value={model.name}
            onChange={(v) => commit(withField(model, 'name', v === '' ? undefined : v))}
            size="form"
            editable={editable}
            placeholder="Optional"
            accessibilityLabel="Study name"
            testID="model-name"
          />
        </FormField>
        <FormField label="Pre-fault voltage" unit="pu" error={errorOf('prefaultPu')} hint="Empty: 1.0 pu" basis={160}>
          <NumCell
            value={model.prefaultPu}
            onChange={(v) => commit(withField(model, 'prefaultPu', v))}
            size="form"
            editable={editable}
            placeholder="1.0"
            accessibilityLabel="Pre-fault voltage"
            testID="model-prefault"
          />
        </FormField>
      </View>
      <Choice
        label="System frequency"
        value={String(model.frequencyHz ?? 60) as '50' | '60'}
        options={[
          { value: '60', label: '60 Hz' },
          { value: '50', label: '50 Hz' },
        ]}
        onChange={(v) => editable && commit({ ...model, frequencyHz: v === '50' ? 50 : 60 })}
        testID="model-frequency"
      />
    </Card>
  );
}

const styles = StyleSheet.create({
  problem: { color: colors.danger, fontSize: 15 },
  fields: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
});
