import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ELECTRONIC_SETTING_NAMES, RELAY_CURVES, type ElectronicSettingName } from '../../shared/schemas/device';
import type { DeviceDefinition } from '../../shared/schemas/deviceLibrary';
import { colors, space } from '../theme';
import { Choice, Field, T } from '../ui';
import { NumberInput, PointsInput } from './inputs';

type Errors = Record<string, string>;
type Props<K extends DeviceDefinition['kind']> = {
  def: Extract<DeviceDefinition, { kind: K }>;
  onChange: (d: DeviceDefinition) => void;
  errors: Errors;
  editable: boolean;
};

const SWITCH_LABELS: Record<ElectronicSettingName, string> = {
  ratingPlug: 'Rating plug (A)',
  longTimePickup: 'Long-time pickup (× In)',
  longTimeDelay: 'Long-time delay (s at stated multiple)',
  shortTimePickup: 'Short-time pickup (× Ir)',
  shortTimeDelay: 'Short-time delay (s)',
  shortTimeI2t: 'Short-time I²t',
  instantaneousPickup: 'Instantaneous pickup (× In)',
  groundFaultPickup: 'Ground-fault pickup (A)',
  groundFaultDelay: 'Ground-fault delay (s)',
};

function ThermalMagnetic({ def, onChange, errors, editable }: Props<'thermal-magnetic'>) {
  const inst = def.instantaneous ?? {};
  return (
    <View style={styles.editor}>
      <View style={styles.row}>
        <NumberInput
          label="Rating"
          unit="A"
          value={def.ratingA}
          onChange={(v) => onChange({ ...def, ratingA: v as number })}
          error={errors.ratingA}
          editable={editable}
          testID="ratingA"
        />
        <NumberInput
          label="Instantaneous clearing"
          unit="cycles"
          value={def.instantaneousClearingCycles}
          onChange={(v) => onChange({ ...def, instantaneousClearingCycles: v })}
          error={errors.instantaneousClearingCycles}
          editable={editable}
          hint="e.g. 1.5 cycles for a molded-case breaker"
        />
      </View>
      <T variant="label">THERMAL BAND (MULTIPLES OF RATING)</T>
      <View style={styles.row}>
        <PointsInput
          label="Minimum curve"
          value={def.thermal.min}
          onChange={(p) => onChange({ ...def, thermal: { ...def.thermal, min: p ?? [] } })}
          error={errors['thermal.min']}
          editable={editable}
        />
        <PointsInput
          label="Maximum curve"
          value={def.thermal.max}
          onChange={(p) => onChange({ ...def, thermal: { ...def.thermal, max: p ?? [] } })}
          error={errors['thermal.max']}
          editable={editable}
        />
      </View>
      <T variant="label">INSTANTANEOUS (MULTIPLE OF RATING, ± TOLERANCE)</T>
      <View style={styles.row}>
        <NumberInput
          label="Pickup"
          unit="× rating"
          value={inst.pickupMultiple}
          onChange={(v) => onChange({ ...def, instantaneous: { ...inst, pickupMultiple: v } })}
          error={errors['instantaneous.pickupMultiple']}
          editable={editable}
          testID="instPickup"
        />
        <NumberInput
          label="Tolerance"
          unit="± %"
          value={inst.tolerancePct}
          onChange={(v) => onChange({ ...def, instantaneous: { ...inst, tolerancePct: v } })}
          error={errors['instantaneous.tolerancePct']}
          editable={editable}
        />
      </View>
      <T variant="small">
        Between the low and high edge of the pickup tolerance the maximum curve stays on the thermal band.
      </T>
    </View>
  );
}

function Fuse({ def, onChange, errors, editable }: Props<'fuse'>) {
  return (
    <View style={styles.editor}>
      <NumberInput
        label="Rating"
        unit="A"
        value={def.ratingA}
        onChange={(v) => onChange({ ...def, ratingA: v as number })}
        error={errors.ratingA}
        editable={editable}
        testID="ratingA"
      />
      <View style={styles.row}>
        <PointsInput
          label="Total clearing (A, s)"
          value={def.totalClearing}
          onChange={(p) => onChange({ ...def, totalClearing: p })}
          error={errors.totalClearing}
          editable={editable}
        />
        <PointsInput
          label="Minimum melting (A, s)"
          value={def.minimumMelt}
          onChange={(p) => onChange({ ...def, minimumMelt: p })}
          error={errors.minimumMelt}
          editable={editable}
        />
      </View>
      <T variant="small">
        Above the highest published current the clearing time is 0.01 s (IEEE 1584 practice: half a cycle).
      </T>
    </View>
  );
}

function Relay({ def, onChange, errors, editable }: Props<'relay'>) {
  return (
    <View style={styles.editor}>
      <Choice
        label="Curve"
        value={def.curve}
        options={RELAY_CURVES.map((c) => ({ value: c, label: c }))}
        onChange={(c) => editable && onChange({ ...def, curve: c })}
        testID="curve"
      />
      <View style={styles.row}>
        <NumberInput
          label="Pickup (primary)"
          unit="A"
          value={def.pickupA}
          onChange={(v) => onChange({ ...def, pickupA: v })}
          error={errors.pickupA}
          editable={editable}
          testID="pickupA"
        />
        <NumberInput
          label="Time dial / multiplier"
          value={def.timeDial}
          onChange={(v) => onChange({ ...def, timeDial: v as number })}
          error={errors.timeDial}
          editable={editable}
          testID="timeDial"
        />
        <NumberInput
          label="Instantaneous (primary)"
          unit="A"
          value={def.instantaneousA}
          onChange={(v) => onChange({ ...def, instantaneousA: v })}
          error={errors.instantaneousA}
          editable={editable}
          hint="Leave empty for none"
        />
      </View>
      <View style={styles.row}>
        <NumberInput
          label="CT ratio"
          value={def.ctRatio}
          onChange={(v) => onChange({ ...def, ctRatio: v })}
          error={errors.ctRatio}
          editable={editable}
          hint="Primary / secondary, e.g. 600/5 = 120"
        />
        <NumberInput
          label="Breaker interrupting time"
          unit="cycles"
          value={def.breakerCycles}
          onChange={(v) => onChange({ ...def, breakerCycles: v as number })}
          error={errors.breakerCycles}
          editable={editable}
          testID="breakerCycles"
        />
        <NumberInput
          label="System frequency"
          unit="Hz"
          value={def.frequencyHz}
          onChange={(v) => onChange({ ...def, frequencyHz: v })}
          error={errors.frequencyHz}
          editable={editable}
        />
      </View>
      <View style={styles.row}>
        <NumberInput
          label="Curve limit"
          unit="× pickup"
          value={def.curveLimitMultiple}
          onChange={(v) => onChange({ ...def, curveLimitMultiple: v })}
          error={errors.curveLimitMultiple}
          editable={editable}
          testID="curveLimitMultiple"
          hint="Above this multiple the inverse curve keeps its time (as the relay declares). Empty: 20"
        />
        <NumberInput
          label="Instantaneous tolerance"
          unit="± %"
          value={def.instantaneousTolerancePct}
          onChange={(v) => onChange({ ...def, instantaneousTolerancePct: v })}
          error={errors.instantaneousTolerancePct}
          editable={editable}
          testID="instantaneousTolerancePct"
          hint="Within it the maximum curve stays on the slower element. Empty: 10"
        />
      </View>
      <T variant="label">DEFINITE-TIME ELEMENT (OPTIONAL)</T>
      <View style={styles.row}>
        <NumberInput
          label="Pickup"
          unit="A"
          value={def.definiteTime?.pickupA}
          onChange={(v) =>
            onChange({
              ...def,
              definiteTime:
                v === undefined && def.definiteTime?.delayS === undefined
                  ? undefined
                  : { delayS: def.definiteTime?.delayS ?? 0, pickupA: v },
            })
          }
          error={errors['definiteTime.pickupA']}
          editable={editable}
        />
        <NumberInput
          label="Delay"
          unit="s"
          value={def.definiteTime?.delayS}
          onChange={(v) =>
            onChange({
              ...def,
              definiteTime:
                v === undefined && def.definiteTime?.pickupA === undefined
                  ? undefined
                  : { pickupA: def.definiteTime?.pickupA, delayS: v ?? 0 },
            })
          }
          error={errors['definiteTime.delayS']}
          editable={editable}
        />
      </View>
    </View>
  );
}

function Band({ def, onChange, errors, editable }: Props<'band'>) {
  return (
    <View style={styles.editor}>
      <View style={styles.row}>
        <NumberInput
          label="Rating"
          unit="A"
          value={def.ratingA}
          onChange={(v) => onChange({ ...def, ratingA: v as number })}
          error={errors.ratingA}
          editable={editable}
          testID="ratingA"
        />
      </View>
      <Choice
        label="Current in the point lists"
        value={def.currentUnit}
        options={[
          { value: 'multiple', label: 'Multiples of rating' },
          { value: 'ampere', label: 'Amperes' },
        ]}
        onChange={(u) => editable && onChange({ ...def, currentUnit: u })}
      />
      <View style={styles.row}>
        <PointsInput
          label="Minimum curve"
          value={def.min}
          onChange={(p) => onChange({ ...def, min: p ?? [] })}
          error={errors.min}
          editable={editable}
          testID="band-min"
        />
        <PointsInput
          label="Maximum curve"
          value={def.max}
          onChange={(p) => onChange({ ...def, max: p ?? [] })}
          error={errors.max}
          editable={editable}
          testID="band-max"
        />
      </View>
    </View>
  );
}

function positionsToText(positions: Record<string, number>): string {
  return Object.entries(positions)
    .sort((a, b) => a[1] - b[1])
    .map(([k, v]) => (k === String(v) ? k : `${k}=${v}`))
    .join(', ');
}

function textToPositions(text: string): Record<string, number> | null {
  const out: Record<string, number> = {};
  for (const part of text
    .split(',')
    .map((p) => p.trim())
    .filter(Boolean)) {
    const [name, value] = part.includes('=') ? part.split('=').map((s) => s.trim()) : [part, part];
    const v = Number(value);
    if (!name || !Number.isFinite(v) || v < 0) return null;
    out[name] = v;
  }
  return Object.keys(out).length ? out : null;
}

/** One switch of the trip unit: pick its position as on the unit; its positions can be edited. */
function SwitchRow({
  name,
  positions,
  chosen,
  onChoose,
  onPositions,
  onRemove,
  editable,
  error,
}: {
  name: ElectronicSettingName;
  positions: Record<string, number>;
  chosen: string | undefined;
  onChoose: (p: string) => void;
  onPositions: (p: Record<string, number>) => void;
  onRemove?: () => void;
  editable: boolean;
  error?: string;
}) {
  const [text, setText] = useState(positionsToText(positions));
  const [bad, setBad] = useState(false);
  return (
    <View style={styles.switch} testID={`switch-${name}`}>
      <Choice
        label={SWITCH_LABELS[name]}
        value={chosen ?? ''}
        options={Object.entries(positions)
          .sort((a, b) => a[1] - b[1])
          .map(([p]) => ({ value: p, label: p }))}
        onChange={(p) => editable && onChoose(p)}
        testID={`pos-${name}`}
      />
      {error ? (
        <T variant="small" style={styles.error}>
          {error}
        </T>
      ) : null}
      {editable ? (
        <Field
          label="Positions (name or name=value, comma-separated; OFF=0)"
          value={text}
          onChangeText={(t) => {
            setText(t);
            const p = textToPositions(t);
            setBad(!p);
            if (p) onPositions(p);
          }}
          error={bad ? 'Write positions like 0.5, 0.6, 1.0 or OFF=0, LO=5' : undefined}
        />
      ) : null}
      {editable && onRemove ? (
        <T accessibilityRole="button" onPress={onRemove} style={styles.removeSwitch}>
          Remove this switch
        </T>
      ) : null}
    </View>
  );
}

function Electronic({ def, onChange, errors, editable }: Props<'electronic'>) {
  const t = def.tripType;
  const settings = t.settings as Partial<Record<ElectronicSettingName, { positions: Record<string, number> }>>;
  const present = ELECTRONIC_SETTING_NAMES.filter((n) => settings[n]);
  const absent = ELECTRONIC_SETTING_NAMES.filter((n) => !settings[n]);
  const setTrip = (patch: Partial<typeof t>) => onChange({ ...def, tripType: { ...t, ...patch } });
  return (
    <View style={styles.editor}>
      <View style={styles.row}>
        <NumberInput
          label="Sensor"
          unit="A"
          value={t.sensorA}
          onChange={(v) => setTrip({ sensorA: v as number })}
          error={errors['tripType.sensorA']}
          editable={editable}
          testID="sensorA"
        />
        <NumberInput
          label="Pickup tolerance"
          unit="± %"
          value={t.pickupTolerancePct}
          onChange={(v) => setTrip({ pickupTolerancePct: v as number })}
          error={errors['tripType.pickupTolerancePct']}
          editable={editable}
        />
        <NumberInput
          label="Breaker clearing"
          unit="s"
          value={t.clearingS}
          onChange={(v) => setTrip({ clearingS: v as number })}
          error={errors['tripType.clearingS']}
          editable={editable}
          hint="Instantaneous region"
        />
        <NumberInput
          label="Long-time delay stated at"
          unit="× Ir"
          value={t.longTimeDelayMultiple}
          onChange={(v) => setTrip({ longTimeDelayMultiple: v })}
          editable={editable}
          hint="Default 6"
        />
      </View>
      <T variant="label">SWITCHES: CHOOSE EACH POSITION AS SET ON THE UNIT</T>
      {present.map((name) => (
        <SwitchRow
          key={name}
          name={name}
          positions={settings[name]!.positions}
          chosen={def.positions[name]}
          editable={editable}
          error={errors[`positions.${name}`]}
          onChoose={(p) => onChange({ ...def, positions: { ...def.positions, [name]: p } })}
          onPositions={(p) => setTrip({ settings: { ...t.settings, [name]: { positions: p } } })}
          onRemove={
            name === 'longTimePickup' || name === 'longTimeDelay'
              ? undefined
              : () => {
                  const nextSettings = { ...t.settings } as Record<string, unknown>;
                  delete nextSettings[name];
                  const nextPositions = { ...def.positions };
                  delete nextPositions[name];
                  onChange({
                    ...def,
                    tripType: { ...t, settings: nextSettings as typeof t.settings },
                    positions: nextPositions,
                  });
                }
          }
        />
      ))}
      {editable && absent.length ? (
        <Choice
          label="Add a switch"
          value=""
          options={absent.map((n) => ({ value: n, label: SWITCH_LABELS[n] }))}
          onChange={(n) => setTrip({ settings: { ...t.settings, [n]: { positions: { OFF: 0 } } } })}
        />
      ) : null}
    </View>
  );
}

/** The settings form of one device type, by kind. */
export function DefinitionEditor({
  def,
  onChange,
  errors,
  editable,
}: {
  def: DeviceDefinition;
  onChange: (d: DeviceDefinition) => void;
  errors: Errors;
  editable: boolean;
}) {
  switch (def.kind) {
    case 'thermal-magnetic':
      return <ThermalMagnetic def={def} onChange={onChange} errors={errors} editable={editable} />;
    case 'fuse':
      return <Fuse def={def} onChange={onChange} errors={errors} editable={editable} />;
    case 'relay':
      return <Relay def={def} onChange={onChange} errors={errors} editable={editable} />;
    case 'band':
      return <Band def={def} onChange={onChange} errors={errors} editable={editable} />;
    case 'electronic':
      return <Electronic def={def} onChange={onChange} errors={errors} editable={editable} />;
  }
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  editor: { gap: space.md },
  switch: { gap: space.xs, paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.lineSoft },
  error: { color: colors.danger },
  removeSwitch: { color: colors.danger },
});
