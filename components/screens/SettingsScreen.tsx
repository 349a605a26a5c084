import React, { useState } from 'react';
import { Pressable, View } from 'react-native';
import { organizationSettingsSchema, type OrganizationSettings } from '../../shared/schemas/organization';
import { serverErrors, validate } from '../../hooks/forms';
import { useOrganization, useUpdateSettings } from '../../hooks/queries';
import { colors, fonts, space, touch } from '../theme';
import { Button, Card, Choice, Field, Notice, Screen, T } from '../ui';

interface LevelRow {
  name: string;
  max: string;
  description: string;
}

/**
 * Organization settings (admin): review interval, signal-word rule, site PPE levels, arc-duration cap, motor decay.
 */
export function SettingsScreen() {
  const org = useOrganization();
  const save = useUpdateSettings();
  const [review, setReview] = useState('60');
  const [danger, setDanger] = useState('40');
  const [cap, setCap] = useState('2000');
  const [motorDecay, setMotorDecay] = useState<OrganizationSettings['motorDecayModel']>('higher');
  const [independent, setIndependent] = useState<'yes' | 'no'>('no');
  const [unitOrder, setUnitOrder] = useState<'us-first' | 'si-first'>('si-first');
  const [notInstalled, setNotInstalled] = useState('30');
  const [reminderHour, setReminderHour] = useState('6');
  const [levels, setLevels] = useState<LevelRow[]>([]);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);

  // The form starts from the stored settings, and follows them when they change on the server.
  const [loadedFrom, setLoadedFrom] = useState<typeof org.data>(undefined);
  if (org.data && org.data !== loadedFrom) {
    setLoadedFrom(org.data);
    const s: OrganizationSettings = org.data.settings;
    setReview(String(s.reviewIntervalMonths));
    setDanger(String(s.signalWord.dangerAboveCalPerCm2));
    setCap(String(s.maxArcDurationMs));
    setMotorDecay(s.motorDecayModel);
    setIndependent(s.requireIndependentApprover ? 'yes' : 'no');
    setUnitOrder(s.labelUnitOrder);
    setNotInstalled(String(s.notInstalledAfterDays));
    setReminderHour(String(s.reminderHourUtc));
    setLevels(
      s.ppeLevels.map((l) => ({ name: l.name, max: String(l.maxCalPerCm2), description: l.description ?? '' })),
    );
  }

  const submit = () => {
    setMessage(null);
    const v = validate(organizationSettingsSchema, {
      reviewIntervalMonths: Number(review),
      signalWord: { dangerAboveCalPerCm2: Number(danger) },
      maxArcDurationMs: Number(cap),
      motorDecayModel: motorDecay,
      requireIndependentApprover: independent === 'yes',
      labelUnitOrder: unitOrder,
      notInstalledAfterDays: notInstalled.trim() === '' ? Number.NaN : Number(notInstalled),
      reminderHourUtc: reminderHour.trim() === '' ? Number.NaN : Number(reminderHour),
      ppeLevels: levels.map((l) => ({
        name: l.name,
        maxCalPerCm2: Number(l.max),
        description: l.description || undefined,
      })),
    });
    if (!v.ok) {
      if (v.errors.notInstalledAfterDays && !/^\d+$/.test(notInstalled.trim()))
        v.errors.notInstalledAfterDays = 'Enter whole days from 1 to 365';
      if (v.errors.reminderHourUtc && !/^\d+$/.test(reminderHour.trim()))
        v.errors.reminderHourUtc = 'Enter a whole hour from 0 to 23';
      setErrors(v.errors);
      setMessage({ tone: 'error', text: 'Some settings need attention (marked below).' });
      return;
    }
    setErrors({});
    save.mutate(v.data, {
      onSuccess: () =>
        setMessage({
          tone: 'ok',
          text: 'Settings saved. New calculations use them; approved studies keep the values they were approved with.',
        }),
      onError: (e) => {
        const s = serverErrors(e);
        setErrors(s.fields);
        setMessage({ tone: 'error', text: s.message });
      },
    });
  };

  const setLevel = (i: number, k: keyof LevelRow) => (v: string) =>
    setLevels((ls) => ls.map((l, j) => (j === i ? { ...l, [k]: v } : l)));

  return (
    <Screen title="Organization settings" subtitle={org.data?.name}>
      {message ? (
        <Notice tone={message.tone} testID="settings-message">
          {message.text}
        </Notice>
      ) : null}
      <Card>
        <T variant="subheading">Reviews</T>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
          <Field
            label="Review interval"
            unit="months"
            numeric
            testID="review"
            value={review}
            onChangeText={setReview}
            error={errors.reviewIntervalMonths}
            hint="NFPA 70E: review at least every 5 years (60 months)"
            containerStyle={{ flexGrow: 1, flexBasis: 220 }}
          />
          <Field
            label="Arc-duration cap"
            unit="ms"
            numeric
            testID="cap"
            value={cap}
            onChangeText={setCap}
            error={errors.maxArcDurationMs}
            hint="IEEE 1584 guidance: 2 s where the worker can move away"
            containerStyle={{ flexGrow: 1, flexBasis: 220 }}
          />
        </View>
        <Choice
          label="The approving engineer must differ from the last editor"
          value={independent}
          options={[
            { value: 'no', label: 'Not required' },
            { value: 'yes', label: 'Required' },
          ]}
          onChange={setIndependent}
          testID="independent"
        />
      </Card>
      <Card testID="motor-decay-settings">
        <T variant="subheading">Motor contribution</T>
        <Choice
          label="A motor’s contribution to the arc over its decay time"
          value={motorDecay}
          options={[
            { value: 'higher', label: 'Both, keep the higher energy (default)' },
            { value: 'step', label: 'Full, then stops' },
            { value: 'exponential', label: 'Decays exponentially' },
          ]}
          onChange={setMotorDecay}
          testID="motor-decay-model"
        />
        {errors.motorDecayModel ? <Notice tone="error">{errors.motorDecayModel}</Notice> : null}
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
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
          <Field
            label="A label needs attention when not installed after"
            unit="days"
            numeric
            testID="not-installed-days"
            value={notInstalled}
            onChangeText={setNotInstalled}
            error={errors.notInstalledAfterDays}
            hint="Counted from the label’s issue; listed on the dashboard after that"
            containerStyle={{ flexGrow: 1, flexBasis: 220 }}
          />
          <Field
            label="Daily reminders go out at"
            unit="hour, UTC, 0–23"
            numeric
            testID="reminder-hour-utc"
            value={reminderHour}
            onChangeText={setReminderHour}
            error={errors.reminderHourUtc}
            hint={
              /^\d{1,2}$/.test(reminderHour.trim())
                ? `${reminderHour.trim().padStart(2, '0')}:00 UTC`
                : 'A whole hour from 0 to 23'
            }
            containerStyle={{ flexGrow: 1, flexBasis: 220 }}
          />
        </View>
      </Card>
      <Card>
        <T variant="subheading">Signal word</T>
        <Field
          label="DANGER above"
          unit="cal/cm²"
          numeric
          testID="danger"
          value={danger}
          onChangeText={setDanger}
          error={errors['signalWord.dangerAboveCalPerCm2']}
          hint="Otherwise WARNING (ANSI Z535.4 signal words). Default 40 cal/cm², common practice."
        />
      </Card>
      <Card>
        <T variant="subheading">Units on labels</T>
        <Choice
          label="Printed first"
          value={unitOrder}
          options={[
            { value: 'us-first', label: 'US customary first (ft-in, then m)' },
            { value: 'si-first', label: 'SI first (m, then ft-in)' },
          ]}
          onChange={setUnitOrder}
          testID="label-unit-order"
        />
        <T variant="small">Applies to labels issued from now on; a printed label keeps the units it was issued with.</T>
      </Card>
      <Card testID="ppe-levels">
        <T variant="subheading">Site PPE levels</T>
        <T variant="small">
          Each level covers incident energies up to its limit. The label shows the first level that covers the energy.
        </T>
        {errors.ppeLevels ? <Notice tone="error">{errors.ppeLevels}</Notice> : null}
        {levels.map((l, i) => (
          <View
            key={i}
            style={{
              flexDirection: 'row',
              flexWrap: 'wrap',
              gap: space.md,
              alignItems: 'flex-start',
              paddingBottom: space.md,
              borderBottomWidth: 1,
              borderBottomColor: colors.lineSoft,
            }}
          >
            <Field
              label="Name"
              value={l.name}
              onChangeText={setLevel(i, 'name')}
              error={errors[`ppeLevels[${i}].name`]}
              containerStyle={{ flexGrow: 1, flexBasis: 160 }}
              testID={`level-${i}-name`}
            />
            <Field
              label="Up to"
              unit="cal/cm²"
              numeric
              value={l.max}
              onChangeText={setLevel(i, 'max')}
              error={errors[`ppeLevels[${i}].maxCalPerCm2`]}
              containerStyle={{ flexGrow: 0, flexBasis: 120 }}
              testID={`level-${i}-max`}
            />
            <Field
              label="What it requires"
              value={l.description}
              onChangeText={setLevel(i, 'description')}
              containerStyle={{ flexGrow: 2, flexBasis: 240 }}
            />
            <Pressable
              accessibilityRole="button"
              accessibilityLabel={`Remove ${l.name}`}
              onPress={() => setLevels((ls) => ls.filter((_, j) => j !== i))}
              style={{ minHeight: touch.min, justifyContent: 'center', marginTop: 20 }}
            >
              <T style={{ color: colors.danger, fontFamily: fonts.textMedium }}>Remove</T>
            </Pressable>
          </View>
        ))}
        <View style={{ flexDirection: 'row' }}>
          <Button
            title="Add a level"
            kind="secondary"
            onPress={() => setLevels((ls) => [...ls, { name: '', max: '', description: '' }])}
          />
        </View>
      </Card>
      <View style={{ flexDirection: 'row' }}>
        <Button title="Save settings" testID="save-settings" busy={save.isPending} onPress={submit} />
      </View>
    </Screen>
  );
}
