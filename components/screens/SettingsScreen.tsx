import React, { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useFieldArray, type FieldErrors } from 'react-hook-form';
import { organizationSettingsSchema, type OrganizationSettings } from '../../shared/schemas/organization';
import { applyServerErrors, ownErrorMessage, useZodForm } from '../../hooks/forms';
import { useOrganization, useUpdateSettings } from '../../hooks/queries';
import { colors, fonts, space, touch } from '../theme';
import { FormChoice, FormNumberField, FormTextField } from '../form';
import { Button, Card, Notice, Screen, T } from '../ui';

/** The settings as entered: numbers as the text typed, the yes/no choice as a word; names are the schema's paths. */
interface SettingsFields {
  reviewIntervalMonths: string;
  signalWord: { dangerAboveCalPerCm2: string };
  maxArcDurationMs: string;
  motorDecayModel: OrganizationSettings['motorDecayModel'];
  requireIndependentApprover: 'yes' | 'no';
  labelUnitOrder: OrganizationSettings['labelUnitOrder'];
  notInstalledAfterDays: string;
  reminderHourUtc: string;
  ppeLevels: { name: string; maxCalPerCm2: string; description: string }[];
}

const blankFields: SettingsFields = {
  reviewIntervalMonths: '60',
  signalWord: { dangerAboveCalPerCm2: '40' },
  maxArcDurationMs: '2000',
  motorDecayModel: 'higher',
  requireIndependentApprover: 'no',
  labelUnitOrder: 'si-first',
  notInstalledAfterDays: '30',
  reminderHourUtc: '6',
  ppeLevels: [],
};

function fieldsOf(s: OrganizationSettings): SettingsFields {
  return {
    reviewIntervalMonths: String(s.reviewIntervalMonths),
    signalWord: { dangerAboveCalPerCm2: String(s.signalWord.dangerAboveCalPerCm2) },
    maxArcDurationMs: String(s.maxArcDurationMs),
    motorDecayModel: s.motorDecayModel,
    requireIndependentApprover: s.requireIndependentApprover ? 'yes' : 'no',
    labelUnitOrder: s.labelUnitOrder,
    notInstalledAfterDays: String(s.notInstalledAfterDays),
    reminderHourUtc: String(s.reminderHourUtc),
    ppeLevels: s.ppeLevels.map((l) => ({
      name: l.name,
      maxCalPerCm2: String(l.maxCalPerCm2),
      description: l.description ?? '',
    })),
  };
}

/** What the schema checks; an empty whole-number field is not a number (the others read as `Number` reads them). */
function inputOf(f: SettingsFields) {
  return {
    reviewIntervalMonths: Number(f.reviewIntervalMonths),
    signalWord: { dangerAboveCalPerCm2: Number(f.signalWord.dangerAboveCalPerCm2) },
    maxArcDurationMs: Number(f.maxArcDurationMs),
    motorDecayModel: f.motorDecayModel,
    requireIndependentApprover: f.requireIndependentApprover === 'yes',
    labelUnitOrder: f.labelUnitOrder,
    notInstalledAfterDays: f.notInstalledAfterDays.trim() === '' ? Number.NaN : Number(f.notInstalledAfterDays),
    reminderHourUtc: f.reminderHourUtc.trim() === '' ? Number.NaN : Number(f.reminderHourUtc),
    ppeLevels: f.ppeLevels.map((l) => ({
      name: l.name,
      maxCalPerCm2: Number(l.maxCalPerCm2),
      description: l.description || undefined,
    })),
  };
}

/** Text that is not a whole number gets a message that says what to type. */
function reword(errors: FieldErrors<SettingsFields>, f: SettingsFields) {
  if (errors.notInstalledAfterDays && !/^\d+$/.test(f.notInstalledAfterDays.trim()))
    errors.notInstalledAfterDays = { type: 'whole', message: 'Enter whole days from 1 to 365' };
  if (errors.reminderHourUtc && !/^\d+$/.test(f.reminderHourUtc.trim()))
    errors.reminderHourUtc = { type: 'whole', message: 'Enter a whole hour from 0 to 23' };
}

/**
 * Organization settings (admin): review interval, signal-word rule, site PPE levels, arc-duration cap, motor decay.
 */
export function SettingsScreen() {
  const org = useOrganization();
  const save = useUpdateSettings();
  // The form starts from the stored settings, and follows them when they change on the server.
  const stored = useMemo(() => (org.data ? fieldsOf(org.data.settings) : undefined), [org.data]);
  const form = useZodForm<typeof organizationSettingsSchema, SettingsFields>(organizationSettingsSchema, {
    defaultValues: stored ?? blankFields,
    values: stored,
    toInput: inputOf,
    reword,
  });
  const levels = useFieldArray({ control: form.control, name: 'ppeLevels' });
  const levelNames = form.watch('ppeLevels');
  const reminderHour = form.watch('reminderHourUtc');
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);

  const submit = () => {
    setMessage(null);
    void form.handleSubmit(
      (data) =>
        save.mutate(data, {
          onSuccess: () =>
            setMessage({
              tone: 'ok',
              text: 'Settings saved. New calculations use them; approved studies keep the values they were approved with.',
            }),
          onError: (e) => setMessage({ tone: 'error', text: applyServerErrors(form, e) }),
        }),
      () => setMessage({ tone: 'error', text: 'Some settings need attention (marked below).' }),
    )();
  };
  const levelsError = ownErrorMessage(form.formState.errors.ppeLevels);

  return (
    <Screen title="Organization settings" subtitle={org.data?.name}>
      {message ? (
        <Notice tone={message.tone} testID="settings-message">
          {message.text}
        </Notice>
      ) : null}
      <Card>
        <T variant="subheading">Reviews</T>
        <View style={styles.fieldRow}>
          <FormNumberField
            control={form.control}
            name="reviewIntervalMonths"
            label="Review interval"
            unit="months"
            testID="review"
            hint="NFPA 70E: review at least every 5 years (60 months)"
            containerStyle={styles.fieldInRow}
          />
          <FormNumberField
            control={form.control}
            name="maxArcDurationMs"
            label="Arc-duration cap"
            unit="ms"
            testID="cap"
            hint="IEEE 1584 guidance: 2 s where the worker can move away"
            containerStyle={styles.fieldInRow}
          />
        </View>
        <FormChoice
          control={form.control}
          name="requireIndependentApprover"
          label="The approving engineer must differ from the last editor"
          options={[
            { value: 'no', label: 'Not required' },
            { value: 'yes', label: 'Required' },
          ]}
          testID="independent"
        />
      </Card>
      <Card testID="motor-decay-settings">
        <T variant="subheading">Motor contribution</T>
        <FormChoice
          control={form.control}
          name="motorDecayModel"
          label="A motor’s contribution to the arc over its decay time"
          options={[
            { value: 'higher', label: 'Both, keep the higher energy (default)' },
            { value: 'step', label: 'Full, then stops' },
            { value: 'exponential', label: 'Decays exponentially' },
          ]}
          testID="motor-decay-model"
        />
        <T variant="small">
          Full, then stops: each motor feeds its full first-cycle current until its decay time, then nothing — the
          higher current while it lasts. Decays exponentially: the current falls as e^(−t/τ), τ the decay time, and is
          dropped after 5 τ, so a smaller current flows for longer; where a motor keeps the arc going or slows a device,
          this can give the higher energy. Neither is always higher, so the default evaluates every case with motor
          contribution both ways and keeps the higher energy; each case’s trace says which model governed. Choose one
          model only to compare with an earlier study. Applies to runs started from now on; each run’s report states the
          model it used.
        </T>
      </Card>
      <Card testID="attention-settings">
        <T variant="subheading">Attention and reminders</T>
        <View style={styles.fieldRow}>
          <FormNumberField
            control={form.control}
            name="notInstalledAfterDays"
            label="A label needs attention when not installed after"
            unit="days"
            testID="not-installed-days"
            hint="Counted from the label’s issue; listed on the dashboard after that"
            containerStyle={styles.fieldInRow}
          />
          <FormNumberField
            control={form.control}
            name="reminderHourUtc"
            label="Daily reminders go out at"
            unit="hour, UTC, 0–23"
            testID="reminder-hour-utc"
            hint={
              /^\d{1,2}$/.test(reminderHour.trim())
                ? `${reminderHour.trim().padStart(2, '0')}:00 UTC`
                : 'A whole hour from 0 to 23'
            }
            containerStyle={styles.fieldInRow}
          />
        </View>
      </Card>
      <Card>
        <T variant="subheading">Signal word</T>
        <FormNumberField
          control={form.control}
          name="signalWord.dangerAboveCalPerCm2"
          label="DANGER above"
          unit="cal/cm²"
          testID="danger"
          hint="Otherwise WARNING (ANSI Z535.4 signal words). Default 40 cal/cm², common practice."
        />
      </Card>
      <Card>
        <T variant="subheading">Units on labels</T>
        <FormChoice
          control={form.control}
          name="labelUnitOrder"
          label="Printed first"
          options={[
            { value: 'us-first', label: 'US customary first (ft-in, then m)' },
            { value: 'si-first', label: 'SI first (m, then ft-in)' },
          ]}
          testID="label-unit-order"
        />
        <T variant="small">Applies to labels issued from now on; a printed label keeps the units it was issued with.</T>
      </Card>
      <Card testID="ppe-levels">
        <T variant="subheading">Site PPE levels</T>
        <T variant="small">
          Each level covers incident energies up to its limit. The label shows the first level that covers the energy.
        </T>
        {levelsError ? <Notice tone="error">{levelsError}</Notice> : null}
        {levels.fields.map((l, i) => (
          <View key={l.id} style={styles.level}>
            <FormTextField
              control={form.control}
              name={`ppeLevels.${i}.name`}
              label="Name"
              containerStyle={styles.levelName}
              testID={`level-${i}-name`}
            />
            <FormNumberField
              control={form.control}
              name={`ppeLevels.${i}.maxCalPerCm2`}
              label="Up to"
              unit="cal/cm²"
              containerStyle={styles.levelMax}
              testID={`level-${i}-max`}
            />
            <FormTextField
              control={form.control}
              name={`ppeLevels.${i}.description`}
              label="What it requires"
              containerStyle={styles.levelDescription}
            />
            <Pressable
              accessibilityRole="button"
              accessibilityLabel={`Remove ${levelNames[i]?.name ?? l.name}`}
              onPress={() => levels.remove(i)}
              style={styles.removeLevel}
            >
              <T style={styles.removeText}>Remove</T>
            </Pressable>
          </View>
        ))}
        <View style={styles.buttonRow}>
          <Button
            title="Add a level"
            kind="secondary"
            onPress={() => levels.append({ name: '', maxCalPerCm2: '', description: '' })}
          />
        </View>
      </Card>
      <View style={styles.buttonRow}>
        <Button title="Save settings" testID="save-settings" busy={save.isPending} onPress={submit} />
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  fieldRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  fieldInRow: { flexGrow: 1, flexBasis: 220 },
  level: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    gap: space.md,
    alignItems: 'flex-start',
    paddingBottom: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  levelName: { flexGrow: 1, flexBasis: 160 },
  levelMax: { flexGrow: 0, flexBasis: 120 },
  levelDescription: { flexGrow: 2, flexBasis: 240 },
  removeLevel: { minHeight: touch.min, justifyContent: 'center', marginTop: 20 },
  removeText: { color: colors.danger, fontFamily: fonts.textMedium },
  buttonRow: { flexDirection: 'row' },
});
