import React, { useState } from 'react';
import { View } from 'react-native';
import {
  EQUIPMENT_CLASSES,
  ELECTRODE_CONFIGS,
  ELECTRODE_CONFIG_LABELS,
  type ElectrodeConfig,
} from '../../shared/equipmentClasses';
import { incidentEnergyRequestSchema } from '../../shared/schemas/incidentEnergy';
import { serverErrors, validate } from '../../hooks/forms';
import { useIncidentEnergy } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { fromDisplay, toDisplay, type LengthUnit } from '../../hooks/units';
import { Cautions } from '../Cautions';
import { EnergyResult } from '../results/EnergyResult';
import { colors, space } from '../theme';
import { Button, Card, Choice, Field, Notice, Screen, T } from '../ui';

type DurationMode = 'one' | 'two';

interface FormState {
  preset: string;
  voltageV: string;
  boltedFaultKa: string;
  electrodeConfig: ElectrodeConfig;
  gap: string;
  workingDistance: string;
  height: string;
  width: string;
  depth: string;
  durationMode: DurationMode;
  arcDurationMs: string;
  fullMs: string;
  reducedMs: string;
}

const round = (v: number) => String(Math.round(v * 10) / 10);

function presetValues(id: string, unit: LengthUnit): Partial<FormState> {
  const c = EQUIPMENT_CLASSES.find((e) => e.id === id);
  if (!c) return {};
  const len = (mm: number | null | undefined) => (mm ? round(toDisplay(mm, unit)) : '');
  return {
    preset: id,
    electrodeConfig: c.electrodeConfig,
    gap: len(c.gapMm),
    workingDistance: len(c.workingDistanceMm),
    height: len(c.enclosureMm?.height),
    width: len(c.enclosureMm?.width),
    depth: len(c.enclosureMm?.depth),
  };
}

const num = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

/** One equipment, no model: IEEE 1584-2018 incident energy with both cases and the label values. */
export function SpotCheckScreen() {
  const canRun = useCan()('spotCheck');
  const { wide } = useLayout();
  const [unit, setUnit] = useState<LengthUnit>('mm');
  const [form, setForm] = useState<FormState>(() => ({
    voltageV: '480',
    boltedFaultKa: '25',
    durationMode: 'one',
    arcDurationMs: '50',
    fullMs: '50',
    reducedMs: '80',
    electrodeConfig: 'VCB',
    gap: '',
    workingDistance: '',
    height: '',
    width: '',
    depth: '',
    preset: '',
    ...presetValues('mcc-panelboard-lv-deep', 'mm'),
  }));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const calc = useIncidentEnergy();
  const set = (k: keyof FormState) => (v: string) => setForm((f) => ({ ...f, [k]: v }));
  const openAir = form.electrodeConfig === 'VOA' || form.electrodeConfig === 'HOA';

  const switchUnit = (next: LengthUnit) => {
    if (next === unit) return;
    const conv = (s: string) => {
      const v = num(s);
      return v === undefined || !Number.isFinite(v) ? s : round(toDisplay(fromDisplay(v, unit), next));
    };
    setForm((f) => ({
      ...f,
      gap: conv(f.gap),
      workingDistance: conv(f.workingDistance),
      height: conv(f.height),
      width: conv(f.width),
      depth: conv(f.depth),
    }));
    setUnit(next);
  };

  const body = () => {
    const mm = (s: string) => {
      const v = num(s);
      return v === undefined ? undefined : fromDisplay(v, unit);
    };
    const enclosure =
      openAir || (!form.height && !form.width && !form.depth)
        ? undefined
        : { height: mm(form.height), width: mm(form.width), depth: mm(form.depth) };
    return {
      voltageV: num(form.voltageV),
      boltedFaultKa: num(form.boltedFaultKa),
      electrodeConfig: form.electrodeConfig,
      gapMm: mm(form.gap),
      workingDistanceMm: mm(form.workingDistance),
      enclosureMm: enclosure,
      ...(form.durationMode === 'one'
        ? { arcDurationMs: num(form.arcDurationMs) }
        : { clearingMs: { full: num(form.fullMs), reduced: num(form.reducedMs) } }),
    };
  };

  const submit = () => {
    setMessage(null);
    const v = validate(incidentEnergyRequestSchema, body());
    if (!v.ok) return setErrors(v.errors);
    setErrors({});
    calc.mutate(v.data, {
      onError: (e) => {
        const s = serverErrors(e);
        setMessage(s.message);
        setErrors(s.fields);
      },
    });
  };

  const fieldStyle = { flexGrow: 1, flexBasis: 140 } as const;
  const inputs = (
    <View style={{ gap: space.lg }}>
      {!canRun ? (
        <Notice>
          Spot checks are run by engineers. You can look at the typical values of each equipment class here.
        </Notice>
      ) : null}
      <Card>
        <T variant="subheading">Equipment class</T>
        <T variant="small">
          A preset fills the typical gap, enclosure and working distance (IEEE 1584-2018 typical values); every field
          stays editable.
        </T>
        <Choice
          value={form.preset}
          options={EQUIPMENT_CLASSES.map((c) => ({ value: c.id, label: c.label }))}
          onChange={(id) => setForm((f) => ({ ...f, ...presetValues(id, unit) }))}
          testID="preset"
        />
      </Card>
      <Card>
        <View
          style={{
            flexDirection: 'row',
            justifyContent: 'space-between',
            alignItems: 'center',
            flexWrap: 'wrap',
            gap: space.sm,
          }}
        >
          <T variant="subheading">Inputs</T>
          <Choice
            value={unit}
            options={[
              { value: 'mm', label: 'mm' },
              { value: 'in', label: 'in' },
            ]}
            onChange={switchUnit}
            testID="unit"
          />
        </View>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
          <Field
            label="Nominal voltage"
            unit="V"
            numeric
            testID="voltageV"
            value={form.voltageV}
            onChangeText={set('voltageV')}
            error={errors.voltageV}
            editable={canRun}
            containerStyle={fieldStyle}
          />
          <Field
            label="Bolted fault current"
            unit="kA"
            numeric
            testID="boltedFaultKa"
            value={form.boltedFaultKa}
            onChangeText={set('boltedFaultKa')}
            error={errors.boltedFaultKa}
            editable={canRun}
            containerStyle={fieldStyle}
          />
        </View>
        <Choice
          label="Electrode configuration"
          value={form.electrodeConfig}
          options={ELECTRODE_CONFIGS.map((c) => ({ value: c, label: c }))}
          onChange={(c) => canRun && setForm((f) => ({ ...f, electrodeConfig: c }))}
          testID="config"
        />
        <T variant="small">{ELECTRODE_CONFIG_LABELS[form.electrodeConfig]}</T>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
          <Field
            label="Gap between conductors"
            unit={unit}
            numeric
            testID="gap"
            value={form.gap}
            onChangeText={set('gap')}
            error={errors.gapMm}
            editable={canRun}
            containerStyle={fieldStyle}
          />
          <Field
            label="Working distance"
            unit={unit}
            numeric
            testID="workingDistance"
            value={form.workingDistance}
            onChangeText={set('workingDistance')}
            error={errors.workingDistanceMm}
            editable={canRun}
            containerStyle={fieldStyle}
          />
        </View>
        {!openAir ? (
          <>
            <T variant="label">ENCLOSURE ({unit})</T>
            <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
              <Field
                label="Height"
                numeric
                testID="height"
                value={form.height}
                onChangeText={set('height')}
                error={errors['enclosureMm.height']}
                editable={canRun}
                containerStyle={{ flexGrow: 1, flexBasis: 90 }}
              />
              <Field
                label="Width"
                numeric
                testID="width"
                value={form.width}
                onChangeText={set('width')}
                error={errors['enclosureMm.width']}
                editable={canRun}
                containerStyle={{ flexGrow: 1, flexBasis: 90 }}
              />
              <Field
                label="Depth"
                numeric
                testID="depth"
                value={form.depth}
                onChangeText={set('depth')}
                error={errors['enclosureMm.depth']}
                editable={canRun}
                containerStyle={{ flexGrow: 1, flexBasis: 90 }}
              />
            </View>
          </>
        ) : (
          <T variant="small">Open air: no enclosure correction (CF = 1).</T>
        )}
        <Choice
          label="Arc duration"
          value={form.durationMode}
          options={[
            { value: 'one', label: 'One duration for both cases' },
            { value: 'two', label: 'Clearing time of each case' },
          ]}
          onChange={(m) => canRun && setForm((f) => ({ ...f, durationMode: m }))}
          testID="duration-mode"
        />
        {form.durationMode === 'one' ? (
          <Field
            label="Arc duration"
            unit="ms"
            numeric
            testID="arcDurationMs"
            value={form.arcDurationMs}
            onChangeText={set('arcDurationMs')}
            error={errors.arcDurationMs}
            editable={canRun}
            hint="From the upstream device’s trip band at the arcing current"
          />
        ) : (
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
            <Field
              label="At the full arcing current"
              unit="ms"
              numeric
              testID="fullMs"
              value={form.fullMs}
              onChangeText={set('fullMs')}
              error={errors['clearingMs.full']}
              editable={canRun}
              containerStyle={fieldStyle}
            />
            <Field
              label="At the reduced arcing current"
              unit="ms"
              numeric
              testID="reducedMs"
              value={form.reducedMs}
              onChangeText={set('reducedMs')}
              error={errors['clearingMs.reduced']}
              editable={canRun}
              containerStyle={fieldStyle}
            />
          </View>
        )}
        {message ? (
          <Notice tone="error" testID="spot-error">
            {message}
          </Notice>
        ) : null}
        {canRun ? <Button title="Calculate" testID="calculate" busy={calc.isPending} onPress={submit} /> : null}
      </Card>
    </View>
  );

  const results = (
    <View style={{ gap: space.lg }}>
      {calc.data ? (
        <EnergyResult result={calc.data} unit={unit} />
      ) : (
        <Card style={{ borderStyle: 'dashed', borderColor: colors.line }}>
          <T variant="subheading">Result</T>
          <T variant="small">
            Enter the equipment and press Calculate. Both the full and the reduced arcing current are evaluated, each
            with its own arc duration; the larger energy governs.
          </T>
        </Card>
      )}
      <Cautions reviewed={false} incidentEnergyCalPerCm2={calc.data?.incidentEnergyCalPerCm2} />
    </View>
  );

  return (
    <Screen
      title="Spot check"
      subtitle="One equipment, no model: IEEE 1584-2018 arcing currents, incident energy and label values."
    >
      {wide ? (
        <View style={{ flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' }}>
          <View style={{ flex: 1 }}>{inputs}</View>
          <View style={{ flex: 1 }}>{results}</View>
        </View>
      ) : (
        <>
          {inputs}
          {results}
        </>
      )}
    </Screen>
  );
}
