import React, { useState } from 'react';
import { View } from 'react-native';
import {
  EQUIPMENT_CLASSES,
  ELECTRODE_CONFIGS,
  ELECTRODE_CONFIG_LABELS,
  type ElectrodeConfig,
} from '../../shared/equipmentClasses';
import { incidentEnergyRequestSchema } from '../../shared/schemas/incidentEnergy';
import { applyServerErrors, useZodForm } from '../../hooks/forms';
import { useIncidentEnergy } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { fromDisplay, toDisplay, type LengthUnit } from '../../hooks/units';
import { Cautions } from '../Cautions';
import { EnergyResult } from '../results/EnergyResult';
import { colors, space } from '../theme';
import { FormNumberField } from '../form';
import { Button, Card, Choice, Notice, Screen, T } from '../ui';

type DurationMode = 'one' | 'two';

/**
 * The inputs as entered, named by the request's paths so each message lands under its field: numbers as the text
 * typed, lengths in the unit chosen on the screen (converted to mm for the request), and two choices of the screen.
 */
interface SpotFields {
  preset: string;
  durationMode: DurationMode;
  voltageV: string;
  boltedFaultKa: string;
  electrodeConfig: ElectrodeConfig;
  gapMm: string;
  workingDistanceMm: string;
  enclosureMm: { height: string; width: string; depth: string };
  arcDurationMs: string;
  clearingMs: { full: string; reduced: string };
}

const round = (v: number) => String(Math.round(v * 10) / 10);

/** The fields a preset fills: its typical gap, working distance and enclosure in the unit shown. */
function presetValues(id: string, unit: LengthUnit): Partial<SpotFields> {
  const c = EQUIPMENT_CLASSES.find((e) => e.id === id);
  if (!c) return {};
  const len = (mm: number | null | undefined) => (mm ? round(toDisplay(mm, unit)) : '');
  return {
    preset: id,
    electrodeConfig: c.electrodeConfig,
    gapMm: len(c.gapMm),
    workingDistanceMm: len(c.workingDistanceMm),
    enclosureMm: {
      height: len(c.enclosureMm?.height),
      width: len(c.enclosureMm?.width),
      depth: len(c.enclosureMm?.depth),
    },
  };
}

const num = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

const isOpenAir = (c: ElectrodeConfig) => c === 'VOA' || c === 'HOA';

/** The request from the fields: lengths from the unit shown to mm, the enclosure only for an enclosed configuration. */
function requestOf(f: SpotFields, unit: LengthUnit) {
  const mm = (s: string) => {
    const v = num(s);
    return v === undefined ? undefined : fromDisplay(v, unit);
  };
  const e = f.enclosureMm;
  const enclosure =
    isOpenAir(f.electrodeConfig) || (!e.height && !e.width && !e.depth)
      ? undefined
      : { height: mm(e.height), width: mm(e.width), depth: mm(e.depth) };
  return {
    voltageV: num(f.voltageV),
    boltedFaultKa: num(f.boltedFaultKa),
    electrodeConfig: f.electrodeConfig,
    gapMm: mm(f.gapMm),
    workingDistanceMm: mm(f.workingDistanceMm),
    enclosureMm: enclosure,
    ...(f.durationMode === 'one'
      ? { arcDurationMs: num(f.arcDurationMs) }
      : { clearingMs: { full: num(f.clearingMs.full), reduced: num(f.clearingMs.reduced) } }),
  };
}

const initialFields: SpotFields = {
  voltageV: '480',
  boltedFaultKa: '25',
  durationMode: 'one',
  arcDurationMs: '50',
  clearingMs: { full: '50', reduced: '80' },
  electrodeConfig: 'VCB',
  gapMm: '',
  workingDistanceMm: '',
  enclosureMm: { height: '', width: '', depth: '' },
  preset: '',
  ...presetValues('mcc-panelboard-lv-deep', 'mm'),
};

/** One equipment, no model: IEEE 1584-2018 incident energy with both cases and the label values. */
export function SpotCheckScreen() {
  const canRun = useCan()('spotCheck');
  const { wide } = useLayout();
  const [unit, setUnit] = useState<LengthUnit>('mm');
  const form = useZodForm<typeof incidentEnergyRequestSchema, SpotFields>(incidentEnergyRequestSchema, {
    defaultValues: initialFields,
    toInput: (f) => requestOf(f, unit),
  });
  const [message, setMessage] = useState<string | null>(null);
  const calc = useIncidentEnergy();
  const [preset, electrodeConfig, durationMode] = form.watch(['preset', 'electrodeConfig', 'durationMode']);
  const openAir = isOpenAir(electrodeConfig);

  const fill = (values: Partial<SpotFields>) => {
    for (const [key, value] of Object.entries(values)) form.setValue(key as keyof SpotFields, value as never);
  };

  const switchUnit = (next: LengthUnit) => {
    if (next === unit) return;
    const conv = (s: string) => {
      const v = num(s);
      return v === undefined || !Number.isFinite(v) ? s : round(toDisplay(fromDisplay(v, unit), next));
    };
    const f = form.getValues();
    fill({
      gapMm: conv(f.gapMm),
      workingDistanceMm: conv(f.workingDistanceMm),
      enclosureMm: {
        height: conv(f.enclosureMm.height),
        width: conv(f.enclosureMm.width),
        depth: conv(f.enclosureMm.depth),
      },
    });
    setUnit(next);
  };

  const submit = () => {
    setMessage(null);
    void form.handleSubmit((request) =>
      calc.mutate(request, {
        onError: (e) => setMessage(applyServerErrors(form, e)),
      }),
    )();
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
          value={preset}
          options={EQUIPMENT_CLASSES.map((c) => ({ value: c.id, label: c.label }))}
          onChange={(id) => fill(presetValues(id, unit))}
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
          <FormNumberField
            control={form.control}
            name="voltageV"
            label="Nominal voltage"
            unit="V"
            testID="voltageV"
            editable={canRun}
            containerStyle={fieldStyle}
          />
          <FormNumberField
            control={form.control}
            name="boltedFaultKa"
            label="Bolted fault current"
            unit="kA"
            testID="boltedFaultKa"
            editable={canRun}
            containerStyle={fieldStyle}
          />
        </View>
        <Choice
          label="Electrode configuration"
          value={electrodeConfig}
          options={ELECTRODE_CONFIGS.map((c) => ({ value: c, label: c }))}
          onChange={(c) => canRun && form.setValue('electrodeConfig', c)}
          testID="config"
        />
        <T variant="small">{ELECTRODE_CONFIG_LABELS[electrodeConfig]}</T>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
          <FormNumberField
            control={form.control}
            name="gapMm"
            label="Gap between conductors"
            unit={unit}
            testID="gap"
            editable={canRun}
            containerStyle={fieldStyle}
          />
          <FormNumberField
            control={form.control}
            name="workingDistanceMm"
            label="Working distance"
            unit={unit}
            testID="workingDistance"
            editable={canRun}
            containerStyle={fieldStyle}
          />
        </View>
        {!openAir ? (
          <>
            <T variant="label">ENCLOSURE ({unit})</T>
            <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
              <FormNumberField
                control={form.control}
                name="enclosureMm.height"
                label="Height"
                testID="height"
                editable={canRun}
                containerStyle={{ flexGrow: 1, flexBasis: 90 }}
              />
              <FormNumberField
                control={form.control}
                name="enclosureMm.width"
                label="Width"
                testID="width"
                editable={canRun}
                containerStyle={{ flexGrow: 1, flexBasis: 90 }}
              />
              <FormNumberField
                control={form.control}
                name="enclosureMm.depth"
                label="Depth"
                testID="depth"
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
          value={durationMode}
          options={[
            { value: 'one', label: 'One duration for both cases' },
            { value: 'two', label: 'Clearing time of each case' },
          ]}
          onChange={(m) => canRun && form.setValue('durationMode', m)}
          testID="duration-mode"
        />
        {durationMode === 'one' ? (
          <FormNumberField
            control={form.control}
            name="arcDurationMs"
            label="Arc duration"
            unit="ms"
            testID="arcDurationMs"
            editable={canRun}
            hint="From the upstream device’s trip band at the arcing current"
          />
        ) : (
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
            <FormNumberField
              control={form.control}
              name="clearingMs.full"
              label="At the full arcing current"
              unit="ms"
              testID="fullMs"
              editable={canRun}
              containerStyle={fieldStyle}
            />
            <FormNumberField
              control={form.control}
              name="clearingMs.reduced"
              label="At the reduced arcing current"
              unit="ms"
              testID="reducedMs"
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
