import React, { useEffect, useRef, useState } from 'react';
import { StyleSheet, View } from 'react-native';
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
import { lengthText, lengthUnitOf, readLengthText, type UnitSystem } from '../../hooks/units';
import { useUnitSystem } from '../../hooks/unitSystem';
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

/** The length fields (stored in mm, shown in the user's unit system). */
const LENGTH_KEYS = [
  'gapMm',
  'workingDistanceMm',
  'enclosureMm.height',
  'enclosureMm.width',
  'enclosureMm.depth',
] as const;
type LengthKey = (typeof LENGTH_KEYS)[number];
/** Per length field: the text it was last shown with and the mm value behind it (read back while unedited). */
type ShownLengths = Record<LengthKey, { text: string; value: number | undefined }>;

function textOfKey(f: SpotFields, k: LengthKey): string {
  if (k === 'gapMm' || k === 'workingDistanceMm') return f[k];
  return f.enclosureMm[k.slice('enclosureMm.'.length) as 'height' | 'width' | 'depth'];
}

/** The typical lengths of a preset, mm. */
function presetLengths(id: string): Partial<Record<LengthKey, number | undefined>> {
  const c = EQUIPMENT_CLASSES.find((e) => e.id === id);
  if (!c) return {};
  const mm = (v: number | null | undefined) => (v ? v : undefined);
  return {
    gapMm: mm(c.gapMm),
    workingDistanceMm: mm(c.workingDistanceMm),
    'enclosureMm.height': mm(c.enclosureMm?.height),
    'enclosureMm.width': mm(c.enclosureMm?.width),
    'enclosureMm.depth': mm(c.enclosureMm?.depth),
  };
}

const num = (s: string): number | undefined => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

const isOpenAir = (c: ElectrodeConfig) => c === 'VOA' || c === 'HOA';

/**
 * The request from the fields: lengths in mm (the value behind an unedited field exactly, an edited one converted
 * from the unit shown), the enclosure only for an enclosed configuration.
 */
function requestOf(f: SpotFields, system: UnitSystem, shown: ShownLengths) {
  const mm = (k: LengthKey) => readLengthText(textOfKey(f, k), shown[k], 'mm', system);
  const e = f.enclosureMm;
  const enclosure =
    isOpenAir(f.electrodeConfig) || (!e.height && !e.width && !e.depth)
      ? undefined
      : { height: mm('enclosureMm.height'), width: mm('enclosureMm.width'), depth: mm('enclosureMm.depth') };
  return {
    voltageV: num(f.voltageV),
    boltedFaultKa: num(f.boltedFaultKa),
    electrodeConfig: f.electrodeConfig,
    gapMm: mm('gapMm'),
    workingDistanceMm: mm('workingDistanceMm'),
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
  gapMm: '',
  workingDistanceMm: '',
  enclosureMm: { height: '', width: '', depth: '' },
  preset: 'mcc-panelboard-lv-deep',
  electrodeConfig: EQUIPMENT_CLASSES.find((c) => c.id === 'mcc-panelboard-lv-deep')?.electrodeConfig ?? 'VCB',
};

const NO_LENGTHS: ShownLengths = {
  gapMm: { text: '', value: undefined },
  workingDistanceMm: { text: '', value: undefined },
  'enclosureMm.height': { text: '', value: undefined },
  'enclosureMm.width': { text: '', value: undefined },
  'enclosureMm.depth': { text: '', value: undefined },
};

/** One equipment, no model: IEEE 1584-2018 incident energy with both cases and the label values. */
export function SpotCheckScreen() {
  const canRun = useCan()('spotCheck');
  const { wide } = useLayout();
  const { system, setSystem } = useUnitSystem();
  const unit = lengthUnitOf(system);
  const shown = useRef<ShownLengths>(NO_LENGTHS);
  const systemShown = useRef<UnitSystem>(system);
  const form = useZodForm<typeof incidentEnergyRequestSchema, SpotFields>(incidentEnergyRequestSchema, {
    defaultValues: initialFields,
    toInput: (f) => requestOf(f, systemShown.current, shown.current),
  });
  const [message, setMessage] = useState<string | null>(null);
  const calc = useIncidentEnergy();
  const [preset, electrodeConfig, durationMode] = form.watch(['preset', 'electrodeConfig', 'durationMode']);
  const openAir = isOpenAir(electrodeConfig);

  const fill = (values: Partial<SpotFields>) => {
    for (const [key, value] of Object.entries(values)) form.setValue(key as keyof SpotFields, value as never);
  };

  /** Shows lengths (mm) in the unit system, remembering the value behind each text. */
  const showLengths = (values: Partial<Record<LengthKey, number | undefined>>, sys: UnitSystem) => {
    const next = { ...shown.current };
    for (const k of LENGTH_KEYS) {
      if (!(k in values)) continue;
      const text = lengthText(values[k], 'mm', sys);
      next[k] = { text, value: values[k] };
      form.setValue(k, text);
    }
    shown.current = next;
    systemShown.current = sys;
  };

  const applyPreset = (id: string) => {
    const c = EQUIPMENT_CLASSES.find((e) => e.id === id);
    if (!c) return;
    fill({ preset: id, electrodeConfig: c.electrodeConfig });
    showLengths(presetLengths(id), systemShown.current);
  };

  // The first preset, and every switch of the unit system: each length is read in the unit it was shown in (the
  // stored value itself where it was not edited) and shown again in the new one, so a switch never changes it.
  const started = useRef(false);
  useEffect(() => {
    if (!started.current) {
      started.current = true;
      systemShown.current = system;
      showLengths(presetLengths(initialFields.preset), system);
      return;
    }
    if (systemShown.current === system) return;
    const f = form.getValues();
    const values: Partial<Record<LengthKey, number | undefined>> = {};
    for (const k of LENGTH_KEYS)
      values[k] = readLengthText(textOfKey(f, k), shown.current[k], 'mm', systemShown.current);
    showLengths(values, system);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- runs on a switch of the unit system only
  }, [system]);

  // A Calculate that fails (in the form or on the server) clears the previous result, so no result stands beside an
  // error; a new one clears the last error.
  const submit = () => {
    setMessage(null);
    calc.reset();
    void form.handleSubmit(
      (request) =>
        calc.mutate(request, {
          onSuccess: () => setMessage(null),
          onError: (e) => setMessage(applyServerErrors(form, e)),
        }),
      () => calc.reset(),
    )();
  };

  const inputs = (
    <View style={styles.inputs}>
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
          onChange={applyPreset}
          testID="preset"
        />
      </Card>
      <Card>
        <View style={styles.inputsHead}>
          <T variant="subheading">Inputs</T>
          <Choice
            value={system}
            options={[
              { value: 'si', label: 'mm' },
              { value: 'us', label: 'in' },
            ]}
            onChange={setSystem}
            testID="unit"
          />
        </View>
        <View style={styles.fieldRow}>
          <FormNumberField
            control={form.control}
            name="voltageV"
            label="Nominal voltage"
            unit="V"
            testID="voltageV"
            editable={canRun}
            containerStyle={styles.field}
          />
          <FormNumberField
            control={form.control}
            name="boltedFaultKa"
            label="Bolted fault current"
            unit="kA"
            testID="boltedFaultKa"
            editable={canRun}
            containerStyle={styles.field}
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
        <View style={styles.fieldRow}>
          <FormNumberField
            control={form.control}
            name="gapMm"
            label="Gap between conductors"
            unit={unit}
            testID="gap"
            editable={canRun}
            containerStyle={styles.field}
          />
          <FormNumberField
            control={form.control}
            name="workingDistanceMm"
            label="Working distance"
            unit={unit}
            testID="workingDistance"
            editable={canRun}
            containerStyle={styles.field}
          />
        </View>
        {!openAir ? (
          <>
            <T variant="label">ENCLOSURE ({unit})</T>
            <View style={styles.fieldRow}>
              <FormNumberField
                control={form.control}
                name="enclosureMm.height"
                label="Height"
                testID="height"
                editable={canRun}
                containerStyle={styles.enclosureField}
              />
              <FormNumberField
                control={form.control}
                name="enclosureMm.width"
                label="Width"
                testID="width"
                editable={canRun}
                containerStyle={styles.enclosureField}
              />
              <FormNumberField
                control={form.control}
                name="enclosureMm.depth"
                label="Depth"
                testID="depth"
                editable={canRun}
                containerStyle={styles.enclosureField}
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
          <View style={styles.fieldRow}>
            <FormNumberField
              control={form.control}
              name="clearingMs.full"
              label="At the full arcing current"
              unit="ms"
              testID="fullMs"
              editable={canRun}
              containerStyle={styles.field}
            />
            <FormNumberField
              control={form.control}
              name="clearingMs.reduced"
              label="At the reduced arcing current"
              unit="ms"
              testID="reducedMs"
              editable={canRun}
              containerStyle={styles.field}
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
    <View style={styles.results}>
      {calc.data ? (
        <EnergyResult result={calc.data} unit={unit} />
      ) : (
        <Card style={styles.resultPlaceholder}>
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
        <View style={styles.split}>
          <View style={styles.column}>{inputs}</View>
          <View style={styles.column}>{results}</View>
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

const styles = StyleSheet.create({
  field: { flexGrow: 1, flexBasis: 140 },
  inputs: { gap: space.lg },
  inputsHead: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    flexWrap: 'wrap',
    gap: space.sm,
  },
  fieldRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  enclosureField: { flexGrow: 1, flexBasis: 90 },
  results: { gap: space.lg },
  resultPlaceholder: { borderStyle: 'dashed', borderColor: colors.line },
  split: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  column: { flex: 1 },
});
