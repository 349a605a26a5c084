import { useQuery } from '@tanstack/react-query';
import { useRouter } from 'expo-router';
import React, { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { Device, DeviceKind } from '../../shared/schemas/device';
import {
  DEVICE_KIND_LABELS,
  deviceDefinitionSchema,
  deviceTypeInputSchema,
  genericNoteSentence,
  type DeviceDefinition,
} from '../../shared/schemas/deviceLibrary';
import { callApi } from '../../hooks/api';
import { contract } from '../../shared/api';
import { queryKeys } from '../../hooks/queryKeys';
import { formFieldName, serverErrors, useZodForm, validate } from '../../hooks/forms';
import {
  useBandCurves,
  useClearingTime,
  useDeleteDeviceType,
  useDeviceType,
  useSaveDeviceType,
} from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useDebounced } from '../../hooks/useDebounced';
import { useLayout } from '../../hooks/useLayout';
import { fmt } from '../../hooks/units';
import { DefinitionEditor } from '../devices/DefinitionEditor';
import { FilePicker, NumberInput } from '../devices/inputs';
import { REGION_LABELS } from '../../shared/tripRegions';
import { newDefinition } from '../devices/templates';
import { TimeCurrentPlot } from '../plot/TimeCurrentPlot';
import { colors, fonts, space } from '../theme';
import { FormTextField } from '../form';
import { Button, Card, Choice, Notice, Screen, T } from '../ui';

/** The device with numbers only: electronic trip units are resolved from their switch positions by the server. */
function useResolvedDevice(def: DeviceDefinition | null): { device: Device | null; error: string | null } {
  const key = def ? JSON.stringify(def) : '';
  const resolved = useQuery({
    queryKey: queryKeys.resolvedTripUnit(key),
    queryFn: () => {
      if (!def || def.kind !== 'electronic') throw new Error('Only an electronic trip unit is resolved');
      return callApi(contract.calc.resolveTripUnit, { body: { tripType: def.tripType, positions: def.positions } });
    },
    enabled: !!def && def.kind === 'electronic',
    retry: false,
    placeholderData: (p) => p,
  });
  if (!def) return { device: null, error: null };
  if (def.kind !== 'electronic') return { device: def, error: null };
  return { device: resolved.data?.device ?? null, error: resolved.error ? resolved.error.message : null };
}

function BandReader({
  device,
  onRead,
}: {
  device: Device | null;
  onRead: (r: { currentA: number; timeS: number | null }) => void;
}) {
  const [currentA, setCurrentA] = useState<number | undefined>(undefined);
  const read = useClearingTime();
  const go = () => {
    if (!device || !currentA || !(currentA > 0)) return;
    read.mutate({ device, currentA }, { onSuccess: (r) => onRead({ currentA, timeS: r.clearingTimeS }) });
  };
  const r = read.data;
  return (
    <Card testID="band-reader">
      <T variant="subheading">Read the band</T>
      <T variant="small">
        Enter the current the device sees; the clearing time is read on the maximum (total clearing) curve.
      </T>
      <View style={styles.readRow}>
        <NumberInput label="Current" unit="A" value={currentA} onChange={setCurrentA} testID="read-current" />
        <Button title="Read" testID="read-band" busy={read.isPending} disabled={!device} onPress={go} />
      </View>
      {read.error ? <Notice tone="error">{read.error.message}</Notice> : null}
      {r ? (
        <View style={styles.reading} testID="band-reading">
          <T style={styles.readingLine}>
            {r.clearingTimeS === null ? (
              <T style={styles.noClear}>Does not clear at this current</T>
            ) : (
              <>
                Clears in <T style={styles.clearingTime}>{fmt(r.clearingTimeS)} s</T>
              </>
            )}
          </T>
          <T variant="small">
            Region: <T style={styles.region}>{REGION_LABELS[r.region]}</T> · minimum curve{' '}
            <T style={styles.minimumTime}>{r.minimumTimeS === null ? '—' : `${fmt(r.minimumTimeS)} s`}</T>
          </T>
          {r.warnings.map((w) => (
            <Notice key={w.code + w.message} tone="warning" testID={`warning-${w.code}`}>
              {w.message}
            </Notice>
          ))}
        </View>
      ) : null}
    </Card>
  );
}

/** The type's name, description and source: a form; its definition is edited beside it and checked as it changes. */
const aboutSchema = deviceTypeInputSchema.pick({ name: true, description: true, source: true });

export function DeviceTypeScreen({ id, kind, justSaved }: { id?: string; kind?: DeviceKind; justSaved?: boolean }) {
  const canEdit = useCan()('editDevices');
  const router = useRouter();
  const { wide } = useLayout();
  const existing = useDeviceType(id);
  const save = useSaveDeviceType(id);
  const remove = useDeleteDeviceType();
  const stored = useMemo(
    () =>
      existing.data
        ? { name: existing.data.name, description: existing.data.description, source: existing.data.source }
        : undefined,
    [existing.data],
  );
  const about = useZodForm(aboutSchema, { defaultValues: { name: '', description: '', source: '' }, values: stored });
  const name = about.watch('name');
  const [def, setDef] = useState<DeviceDefinition | null>(id ? null : newDefinition(kind ?? 'thermal-magnetic'));
  // The server's messages on the definition (`definition.` taken off), shown in the definition editor.
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string } | null>(
    justSaved ? { tone: 'ok', text: 'Saved to the device library.' } : null,
  );
  const [reading, setReading] = useState<{ currentA: number; timeS: number | null } | null>(null);

  // The form starts from the stored device type once it has loaded (and follows it when it changes on the server).
  const [loadedFrom, setLoadedFrom] = useState<typeof existing.data>(undefined);
  if (existing.data && existing.data !== loadedFrom) {
    setLoadedFrom(existing.data);
    setDef(existing.data.definition);
  }

  // Only a definition that passes the shared schema is plotted; the form shows what is wrong otherwise.
  const check = useMemo(() => (def ? validate(deviceDefinitionSchema, def) : null), [def]);
  const validDef = check && check.ok ? (check.data as DeviceDefinition) : null;
  const debouncedDef = useDebounced(validDef, 300);
  const { device, error: resolveError } = useResolvedDevice(debouncedDef);
  const curves = useBandCurves(device);
  const fieldErrors = { ...(check && !check.ok ? check.errors : {}), ...errors };

  const onSave = () => {
    setMessage(null);
    if (!def) return;
    void about.handleSubmit((values) =>
      save.mutate(
        { ...values, definition: def },
        {
          onSuccess: (saved) => {
            setErrors({});
            setMessage({ tone: 'ok', text: 'Saved to the device library.' });
            if (!id) router.replace(`/devices/${saved.id}?saved=1`);
          },
          onError: (e) => {
            const s = serverErrors(e);
            const fields: Record<string, string> = {};
            for (const [k, v] of Object.entries(s.fields)) {
              if (k.startsWith('definition.')) fields[k.slice('definition.'.length)] = v;
              else about.setError(formFieldName(k) as keyof typeof values, { type: 'server', message: v });
            }
            setErrors(fields);
            setMessage({ tone: 'error', text: s.message });
          },
        },
      ),
    )();
  };

  const onCsv = async (file: File) => {
    setMessage(null);
    const form = new FormData();
    form.append('file', file);
    try {
      // The unit of the first column is the choice shown above the upload, never guessed from the file.
      const currentUnit = def?.kind === 'band' ? def.currentUnit : 'ampere';
      const r = await callApi(contract.devices.parseBandCsv, { formData: form, query: { currentUnit } });
      setDef((d) => (d && d.kind === 'band' ? { ...d, currentUnit: r.currentUnit, min: r.min, max: r.max } : d));
      setMessage({
        tone: 'ok',
        text: `Read ${r.max.length} maximum and ${r.min.length} minimum points from ${file.name}, the first column in ${r.currentUnit === 'multiple' ? 'multiples of the rating' : 'amperes'}.`,
      });
    } catch (e) {
      const s = serverErrors(e);
      const lines = Object.entries(s.fields).map(([k, v]) => `${k}: ${v}`);
      setMessage({ tone: 'error', text: [s.message, ...lines.slice(0, 8)].join('\n') });
    }
  };

  if (id && existing.error) {
    return (
      <Screen title="Device type">
        <Notice tone="error">{existing.error.message}</Notice>
      </Screen>
    );
  }
  if (!def)
    return (
      <Screen title="Device type">
        <T variant="small">Loading…</T>
      </Screen>
    );

  const plot = (
    <Card testID="device-plot">
      <T variant="subheading">Time-current band</T>
      {resolveError ? <Notice tone="error">{resolveError}</Notice> : null}
      {curves.error ? <Notice tone="error">{curves.error.message}</Notice> : null}
      <TimeCurrentPlot
        testID="tcc"
        currentUnit="A"
        series={
          curves.data
            ? [{ id: 'dev', label: name || DEVICE_KIND_LABELS[def.kind], min: curves.data.min, max: curves.data.max }]
            : []
        }
        verticals={[
          ...(reading ? [{ currentA: reading.currentA, label: 'Read at', tone: 'full' as const }] : []),
          ...curveLimitVertical(def),
        ]}
        marks={
          reading && reading.timeS !== null
            ? [{ currentA: reading.currentA, timeS: reading.timeS, label: 'clears', seriesId: 'dev' }]
            : []
        }
        emptyMessage={check && !check.ok ? 'Fix the settings to see the band.' : 'Loading the band…'}
      />
    </Card>
  );

  const genericNote = id ? existing.data?.genericNote : null;
  const form = (
    <View style={styles.form}>
      {message ? (
        <Notice tone={message.tone} testID="device-message">
          {message.text}
        </Notice>
      ) : null}
      <Card>
        <T variant="label">{DEVICE_KIND_LABELS[def.kind].toUpperCase()}</T>
        <FormTextField control={about.control} name="name" label="Name" testID="device-name" editable={canEdit} />
        <FormTextField control={about.control} name="description" label="Description" editable={canEdit} />
        <FormTextField
          control={about.control}
          name="source"
          label="Source of the data"
          editable={canEdit}
          hint="e.g. the published curve it was read from, with its date"
        />
      </Card>
      <Card>
        <T variant="subheading">Settings</T>
        {def.kind === 'band' && canEdit ? (
          <View style={styles.csvImport}>
            <Choice
              label="The CSV's first column holds"
              value={def.currentUnit}
              options={[
                { value: 'ampere', label: 'Amperes' },
                { value: 'multiple', label: 'Multiples of the rating' },
              ]}
              onChange={(u) => setDef((d) => (d && d.kind === 'band' ? { ...d, currentUnit: u } : d))}
              testID="csv-unit"
            />
            <FilePicker
              accept=".csv,text/csv,text/plain"
              label="Upload a digitized band (CSV: current or multiple, min_s, max_s)"
              onFile={(f) => void onCsv(f)}
            />
          </View>
        ) : null}
        <DefinitionEditor def={def} onChange={setDef} errors={fieldErrors} editable={canEdit} />
      </Card>
      {canEdit ? (
        <View style={styles.buttonRow}>
          <Button
            title={id ? 'Save changes' : 'Add to library'}
            testID="save-device"
            busy={save.isPending}
            onPress={onSave}
          />
          {id ? (
            <Button
              title="Remove from library"
              kind="secondary"
              busy={remove.isPending}
              onPress={() => remove.mutate(id, { onSuccess: () => router.replace('/devices') })}
            />
          ) : null}
        </View>
      ) : null}
    </View>
  );

  return (
    <Screen
      title={id ? name || 'Device type' : `New ${DEVICE_KIND_LABELS[def.kind].toLowerCase()}`}
      subtitle="Device library"
    >
      {genericNote ? (
        <Notice tone="warning" testID="device-generic-note">
          {`${genericNoteSentence(genericNote)} This type is an invented example of its kind, not any maker's data.`}
        </Notice>
      ) : null}
      {wide ? (
        <View style={styles.split}>
          <View style={styles.formColumn}>{form}</View>
          <View style={styles.plotColumn}>
            {plot}
            <BandReader device={device} onRead={setReading} />
          </View>
        </View>
      ) : (
        <>
          {plot}
          <BandReader device={device} onRead={setReading} />
          {form}
        </>
      )}
    </Screen>
  );
}

/** A relay's curve limit: above pickup × curveLimitMultiple (default 20) the inverse-time element keeps its time. */
function curveLimitVertical(def: DeviceDefinition): { currentA: number; label: string; tone: 'neutral' }[] {
  if (def.kind !== 'relay') return [];
  const pickupA =
    def.pickupA ??
    (def.pickupSecondaryA !== undefined && def.ctRatio !== undefined ? def.pickupSecondaryA * def.ctRatio : undefined);
  const multiple = def.curveLimitMultiple ?? 20;
  if (!(pickupA !== undefined && pickupA > 0 && Number.isFinite(pickupA * multiple))) return [];
  return [{ currentA: pickupA * multiple, label: `Curve limit ${multiple} × pickup`, tone: 'neutral' }];
}

const styles = StyleSheet.create({
  readRow: { flexDirection: 'row', gap: space.md, alignItems: 'flex-end', flexWrap: 'wrap' },
  reading: { gap: space.xs },
  readingLine: { fontSize: 18 },
  noClear: { fontFamily: fonts.textBold, fontSize: 18 },
  clearingTime: { fontFamily: fonts.numbersBold, fontSize: 20 },
  region: { fontFamily: fonts.textBold },
  minimumTime: { fontFamily: fonts.numbers },
  form: { gap: space.lg },
  csvImport: { gap: space.xs, padding: space.md, backgroundColor: colors.canvas, borderRadius: 8 },
  buttonRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  split: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  formColumn: { flex: 1 },
  plotColumn: { flex: 1, gap: space.lg },
});
