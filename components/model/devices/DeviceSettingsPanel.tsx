/**
 * The settings of one placed device, edited in the model: a relay's curve, pickup, time dial, instantaneous and
 * breaker; an electronic trip unit's switch positions (its library trip-unit type) or numbers; a thermal-magnetic
 * breaker's instantaneous setting; a fuse from the library. Every change goes through the editor's patch (undo,
 * draft, save) and the model's issues land under the field they name. The band is drawn beside, with the bus's
 * bolted fault and arcing currents of the last run when the study has results for the bus.
 */
import { useMutation, useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, type ReactNode } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { contract } from '../../../shared/api';
import {
  RELAY_CURVES,
  deviceSchema,
  type Device,
  type ElectronicDevice,
  type ElectronicPositions,
  type ElectronicSettingName,
  type FuseDevice,
  type RelayDevice,
  type ThermalMagneticDevice,
} from '../../../shared/schemas/device';
import {
  DEVICE_KIND_LABELS,
  PLOT_LIMITS,
  genericNoteSentence,
  type DeviceType,
} from '../../../shared/schemas/deviceLibrary';
import { queryKeys } from '../../../hooks/queryKeys';
import type { ModelInput } from '../../../shared/schemas/model';
import { callApi } from '../../../hooks/api';
import { serverErrors } from '../../../hooks/forms';
import { useBandCurves } from '../../../hooks/queries';
import { useBusResult } from '../../../hooks/results';
import { useDebounced } from '../../../hooks/useDebounced';
import { TimeCurrentPlot, type TimeCurrentVertical } from '../../plot/TimeCurrentPlot';
import { colors, fonts, space } from '../../theme';
import { Button, Card, Notice, T } from '../../ui';
import { fromLibrary } from '../columns/devices';
import { FormField, IconButton, NumCell, PickCell, SegCell, TextCell, type PickOption } from '../controls';
import {
  deviceSettingsSummary,
  fieldCovers,
  issueMessage,
  num,
  type LocatedIssue,
  type PlacedDeviceInput,
} from '../summaries';
import {
  busOfDevice,
  provenance,
  relayInstantaneousPrimaryA,
  relayPickupMode,
  relayPickupPrimaryA,
  setField,
  tmInstantaneousMode,
  tripUnitSwitches,
  tripUnitTypeOf,
  withPositions,
  withRelayPickupMode,
  withSettings,
  withTmInstantaneousMode,
} from './deviceEdit';

const finiteNum = (v: number | undefined): v is number => v !== undefined && Number.isFinite(v) && v > 0;

export const RELAY_CURVE_LABELS: Record<RelayDevice['curve'], string> = {
  'IEEE-MI': 'IEEE moderately inverse',
  'IEEE-VI': 'IEEE very inverse',
  'IEEE-EI': 'IEEE extremely inverse',
  'IEC-SI': 'IEC standard inverse',
  'IEC-VI': 'IEC very inverse',
  'IEC-EI': 'IEC extremely inverse',
  'IEC-LTI': 'IEC long-time inverse',
};
const CURVE_OPTIONS: PickOption[] = RELAY_CURVES.map((c) => ({
  value: c,
  label: RELAY_CURVE_LABELS[c],
  detail: c.startsWith('IEEE') ? 'IEEE C37.112' : 'IEC 60255-151',
}));

const SWITCH_LABELS: Record<ElectronicSettingName, string> = {
  ratingPlug: 'Rating plug (A)',
  longTimePickup: 'Long-time pickup (× In)',
  longTimeDelay: 'Long-time delay (s)',
  shortTimePickup: 'Short-time pickup (× Ir)',
  shortTimeDelay: 'Short-time delay (s)',
  shortTimeI2t: 'Short-time I²t',
  instantaneousPickup: 'Instantaneous pickup (× In)',
  groundFaultPickup: 'Ground-fault pickup (A)',
  groundFaultDelay: 'Ground-fault delay (s)',
};

/** Brings the panel's top into view each time it is opened (web; the panel is taller than a phone's screen). */
function useScrollToTop(nonce: number) {
  const ref = useRef<View>(null);
  useEffect(() => {
    if (!nonce || Platform.OS !== 'web') return;
    const node = ref.current as unknown as { scrollIntoView?: (o: object) => void } | null;
    const id = setTimeout(() => node?.scrollIntoView?.({ block: 'start', behavior: 'smooth' }), 30);
    return () => clearTimeout(id);
  }, [nonce]);
  return ref;
}

export interface DeviceSettingsPanelProps {
  model: ModelInput;
  index: number;
  typesById: ReadonlyMap<string, DeviceType>;
  issues: readonly LocatedIssue[];
  warnings: readonly LocatedIssue[];
  editable: boolean;
  /** The study whose last run gives the bus's currents (none: no markers). */
  studyId?: string;
  patch: (update: (d: PlacedDeviceInput) => PlacedDeviceInput) => void;
  /** Changes each time the panel is opened: it then scrolls into view (web). */
  openNonce?: number;
  onClose: () => void;
}

export function DeviceSettingsPanel({
  model,
  index,
  typesById,
  issues,
  warnings,
  editable,
  studyId,
  patch,
  openNonce = 0,
  onClose,
}: DeviceSettingsPanelProps) {
  const ref = useScrollToTop(openNonce);
  const placed = (model.devices ?? [])[index] as PlacedDeviceInput | undefined;
  const device = placed?.device as Device | undefined;
  const from = placed ? provenance(placed) : { kind: 'none' as const };
  const libType = placed?.library ? typesById.get(placed.library.deviceTypeId) : undefined;

  const fieldError = (key: string) => {
    const li = issues.find((i) => fieldCovers(`device.${key}`, i.field));
    return li ? issueMessage(li.issue) : undefined;
  };
  const fieldWarning = (key: string) => warnings.find((w) => fieldCovers(`device.${key}`, w.field))?.issue.message;
  const generalIssues = issues.filter(
    (i) => !i.field || i.field === 'device' || !KNOWN_FIELDS.some((k) => fieldCovers(`device.${k}`, i.field)),
  );

  const setDevice = (next: Device) => patch((d) => withSettings(d, next));

  if (!placed) return null;
  const title = placed.id || `Device ${index + 1}`;
  const common = { editable, setDevice, fieldError, fieldWarning };

  return (
    <View ref={ref}>
      <Card testID="device-settings" style={styles.panel}>
        <View style={styles.head}>
          <View style={styles.headText}>
            <T variant="subheading" testID="device-settings-title">{`Settings of ${title}`}</T>
            <T variant="small" testID="device-settings-provenance">
              {device ? `${DEVICE_KIND_LABELS[device.kind]} · ` : ''}
              {from.kind === 'library'
                ? `from the library: ${from.name}`
                : from.kind === 'modified'
                  ? `modified from ${from.name}`
                  : from.kind === 'custom'
                    ? 'set in the model (not from the library)'
                    : 'no settings yet'}
            </T>
            {libType?.genericNote ? (
              <T variant="small" style={styles.warningText}>
                {genericNoteSentence(libType.genericNote)}
              </T>
            ) : null}
          </View>
          <IconButton icon="close" label="Close the device settings" onPress={onClose} testID="device-settings-close" />
        </View>
        {generalIssues.map((li, i) => (
          <T key={i} style={styles.problem} accessibilityRole="alert">
            {issueMessage(li.issue)}
          </T>
        ))}
        {!device ? (
          <NoDevice editable={editable} onStart={setDevice} />
        ) : device.kind === 'relay' ? (
          <RelayFields r={device} {...common} />
        ) : device.kind === 'electronic' ? (
          <ElectronicFields
            e={device}
            placed={placed}
            typesById={typesById}
            patch={patch}
            positionsError={issues.find((i) => fieldCovers('library.positions', i.field))}
            {...common}
          />
        ) : device.kind === 'thermal-magnetic' ? (
          <ThermalMagneticFields tm={device} {...common} />
        ) : device.kind === 'fuse' ? (
          <FuseFields f={device} placed={placed} typesById={typesById} editable={editable} patch={patch} />
        ) : (
          <T variant="small">
            A digitized band is edited in the device library (its points); here it is drawn at the bus’s currents.
          </T>
        )}
        {device ? <BandBeside placed={placed} device={device} model={model} studyId={studyId} /> : null}
      </Card>
    </View>
  );
}

const KNOWN_FIELDS = [
  'curve',
  'pickupA',
  'ctRatio',
  'pickupSecondaryA',
  'timeDial',
  'instantaneousA',
  'instantaneousSecondaryA',
  'breakerCycles',
  'sensorA',
  'longTime',
  'shortTime',
  'instantaneous',
  'pickupTolerancePct',
  'clearingS',
  'ratingA',
];

interface FieldsCommon {
  editable: boolean;
  setDevice: (d: Device) => void;
  fieldError: (key: string) => string | undefined;
  fieldWarning: (key: string) => string | undefined;
}

function Row({ children }: { children: ReactNode }) {
  return <View style={styles.row}>{children}</View>;
}

function Num({
  label,
  unit,
  value,
  onChange,
  error,
  warning,
  hint,
  editable,
  testID,
  placeholder,
}: {
  label: string;
  unit?: string;
  value: number | undefined;
  onChange: (v: number | undefined) => void;
  error?: string;
  warning?: string;
  hint?: string;
  editable: boolean;
  testID: string;
  placeholder?: string;
}) {
  return (
    <FormField
      label={label}
      unit={unit}
      error={error}
      hint={error ? undefined : warning ? undefined : hint}
      basis={140}
    >
      <NumCell
        value={value}
        onChange={onChange}
        size="form"
        invalid={!!error}
        editable={editable}
        testID={testID}
        accessibilityLabel={unit ? `${label} (${unit})` : label}
        placeholder={placeholder}
      />
      {!error && warning ? (
        <T variant="small" style={styles.warningText} testID={`${testID}-warning`}>
          {warning}
        </T>
      ) : null}
    </FormField>
  );
}

function NoDevice({ editable, onStart }: { editable: boolean; onStart: (d: Device) => void }) {
  return (
    <View style={styles.noDevice}>
      <T variant="small">Choose a device type from the library in the device’s row, or set a relay here by hand.</T>
      {editable ? (
        <Button
          title="Set a relay by hand"
          kind="secondary"
          testID="device-settings-new-relay"
          onPress={() =>
            onStart({ kind: 'relay', curve: 'IEEE-VI', timeDial: 1, breakerCycles: 5 } as unknown as Device)
          }
        />
      ) : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Relay

function RelayFields({ r, editable, setDevice, fieldError, fieldWarning }: FieldsCommon & { r: RelayDevice }) {
  const mode = relayPickupMode(r);
  // The instantaneous pickup is shown the way it is stored (a CT relay may give it in primary amperes).
  const instPrimary = r.instantaneousA !== undefined || (r.instantaneousSecondaryA === undefined && mode === 'primary');
  const set = <K extends keyof RelayDevice>(k: K, v: RelayDevice[K] | undefined) => setDevice(setField(r, k, v));
  const primary = relayPickupPrimaryA(r);
  const inst = relayInstantaneousPrimaryA(r);
  const f = (k: string) => ({ error: fieldError(k), warning: fieldWarning(k) });
  return (
    <View style={styles.fields}>
      <Row>
        <FormField label="Curve" error={fieldError('curve')} basis={240}>
          <PickCell
            value={r.curve}
            options={CURVE_OPTIONS}
            onChange={(v) => set('curve', v as RelayDevice['curve'])}
            title="Relay curve"
            size="form"
            invalid={!!fieldError('curve')}
            editable={editable}
            testID="relay-curve"
            accessibilityLabel="Relay curve"
          />
        </FormField>
      </Row>
      <Row>
        <FormField label="Pickups given as" basis={240}>
          <SegCell
            value={mode}
            options={[
              { value: 'primary', label: 'Primary A' },
              { value: 'ct', label: 'Secondary A (CT)' },
            ]}
            onChange={(v) => setDevice(withRelayPickupMode(r, v))}
            size="form"
            invalid={false}
            editable={editable}
            testID="relay-pickup-mode"
            accessibilityLabel="Pickups given as"
          />
        </FormField>
      </Row>
      <Row>
        {mode === 'ct' ? (
          <Num
            label="CT ratio"
            value={r.ctRatio}
            onChange={(v) => set('ctRatio', v)}
            {...f('ctRatio')}
            hint="Primary over secondary (600/5 = 120)"
            editable={editable}
            testID="relay-ct-ratio"
          />
        ) : null}
        {mode === 'primary' ? (
          <Num
            label="Pickup"
            unit="A"
            value={r.pickupA}
            onChange={(v) => set('pickupA', v)}
            {...f('pickupA')}
            editable={editable}
            testID="relay-pickup"
          />
        ) : (
          <Num
            label="Pickup"
            unit="secondary A"
            value={r.pickupSecondaryA}
            onChange={(v) => set('pickupSecondaryA', v)}
            {...f('pickupSecondaryA')}
            hint={primary !== undefined ? `${num(primary)} A primary` : undefined}
            editable={editable}
            testID="relay-pickup-secondary"
          />
        )}
      </Row>
      <Row>
        {instPrimary ? (
          <Num
            label="Instantaneous"
            unit="A primary"
            value={r.instantaneousA}
            onChange={(v) => set('instantaneousA', v)}
            {...f('instantaneousA')}
            hint={
              r.instantaneousA === undefined
                ? 'Empty: no instantaneous element'
                : mode === 'ct' && finiteNum(r.ctRatio)
                  ? `${num(r.instantaneousA / r.ctRatio)} A secondary`
                  : undefined
            }
            placeholder="Off"
            editable={editable}
            testID="relay-instantaneous"
          />
        ) : (
          <Num
            label="Instantaneous"
            unit="secondary A"
            value={r.instantaneousSecondaryA}
            onChange={(v) => set('instantaneousSecondaryA', v)}
            {...f('instantaneousSecondaryA')}
            hint={inst !== undefined ? `${num(inst)} A primary` : 'Empty: no instantaneous element'}
            placeholder="Off"
            editable={editable}
            testID="relay-instantaneous-secondary"
          />
        )}
      </Row>
      <Row>
        <Num
          label={r.curve.startsWith('IEC') ? 'Time multiplier' : 'Time dial'}
          value={r.timeDial}
          onChange={(v) => set('timeDial', v as number)}
          {...f('timeDial')}
          editable={editable}
          testID="relay-time-dial"
        />
        <Num
          label="Breaker"
          unit="cycles"
          value={r.breakerCycles}
          onChange={(v) => set('breakerCycles', v as number)}
          {...f('breakerCycles')}
          hint="Interrupting time (IEEE 1584: 1.5 / 3 / 5 / 8)"
          editable={editable}
          testID="relay-breaker-cycles"
        />
      </Row>
      {r.definiteTime ? (
        <T variant="small">{`Definite-time element kept as set: ${num(r.definiteTime.delayS)} s delay.`}</T>
      ) : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Electronic trip unit

function ElectronicFields({
  e,
  placed,
  typesById,
  patch,
  positionsError,
  editable,
  setDevice,
  fieldError,
  fieldWarning,
}: FieldsCommon & {
  e: ElectronicDevice;
  placed: PlacedDeviceInput;
  typesById: ReadonlyMap<string, DeviceType>;
  patch: (update: (d: PlacedDeviceInput) => PlacedDeviceInput) => void;
  positionsError?: LocatedIssue;
}) {
  const unit = tripUnitTypeOf(placed, typesById);
  const resolve = useMutation({
    mutationFn: (input: { positions: ElectronicPositions }) => {
      if (!unit) throw new Error('No trip-unit type');
      return callApi(contract.calc.resolveTripUnit, { body: { tripType: unit.tripType, positions: input.positions } });
    },
  });
  if (unit) {
    const choose = (name: ElectronicSettingName, position: string) => {
      const positions = { ...unit.positions, [name]: position };
      resolve.mutate(
        { positions },
        { onSuccess: (r) => patch((d) => withPositions(d, positions, r.device as ElectronicDevice)) },
      );
    };
    return (
      <View style={styles.fields}>
        <T variant="small">{`Switch positions of the trip-unit type ${unit.tripType.name}.`}</T>
        <Row>
          {tripUnitSwitches(unit.tripType).map((s) => (
            <FormField key={s.name} label={SWITCH_LABELS[s.name]} basis={150}>
              <PickCell
                value={unit.positions[s.name]}
                options={s.positions.map((p) => ({ value: p, label: p }))}
                onChange={(v) => choose(s.name, v)}
                title={SWITCH_LABELS[s.name]}
                size="form"
                invalid={false}
                editable={editable && !resolve.isPending}
                testID={`trip-switch-${s.name}`}
                accessibilityLabel={SWITCH_LABELS[s.name]}
              />
            </FormField>
          ))}
        </Row>
        {resolve.error ? (
          <Notice tone="error">{serverErrors(resolve.error).message}</Notice>
        ) : positionsError ? (
          <T style={styles.errorText}>{issueMessage(positionsError.issue)}</T>
        ) : null}
        <T variant="small" testID="trip-resolved">{`Resolved: ${deviceSettingsSummary(e)}`}</T>
      </View>
    );
  }
  const f = (k: string) => ({ error: fieldError(k), warning: fieldWarning(k) });
  const set = (next: ElectronicDevice) => setDevice(next);
  return (
    <View style={styles.fields}>
      <Row>
        <Num
          label="Sensor In"
          unit="A"
          value={e.sensorA}
          onChange={(v) => set({ ...e, sensorA: v as number })}
          {...f('sensorA')}
          editable={editable}
          testID="etu-sensor"
        />
        <Num
          label="Long-time pickup"
          unit="× In"
          value={e.longTime.pickup}
          onChange={(v) => set({ ...e, longTime: { ...e.longTime, pickup: v as number } })}
          {...f('longTime.pickup')}
          editable={editable}
          testID="etu-lt-pickup"
        />
        <Num
          label="Long-time delay"
          unit="s"
          value={e.longTime.delayS}
          onChange={(v) => set({ ...e, longTime: { ...e.longTime, delayS: v as number } })}
          {...f('longTime.delayS')}
          hint={`At ${num(e.longTime.delayMultiple ?? 6)} × Ir`}
          editable={editable}
          testID="etu-lt-delay"
        />
      </Row>
      {e.shortTime ? (
        <Row>
          <Num
            label="Short-time pickup"
            unit="× Ir"
            value={e.shortTime.pickup}
            onChange={(v) => set({ ...e, shortTime: { ...e.shortTime!, pickup: v as number } })}
            {...f('shortTime.pickup')}
            editable={editable}
            testID="etu-st-pickup"
          />
          <Num
            label="Short-time delay"
            unit="s"
            value={e.shortTime.delayS}
            onChange={(v) => set({ ...e, shortTime: { ...e.shortTime!, delayS: v as number } })}
            {...f('shortTime.delayS')}
            editable={editable}
            testID="etu-st-delay"
          />
        </Row>
      ) : null}
      <Row>
        <Num
          label="Instantaneous pickup"
          unit="× In"
          value={e.instantaneous?.pickup}
          onChange={(v) => {
            const { instantaneous: _i, ...rest } = e;
            set(v === undefined ? (rest as ElectronicDevice) : { ...e, instantaneous: { pickup: v } });
          }}
          {...f('instantaneous')}
          hint="Empty: no instantaneous element"
          placeholder="Off"
          editable={editable}
          testID="etu-inst-pickup"
        />
        <Num
          label="Clearing in the instantaneous region"
          unit="s"
          value={e.clearingS}
          onChange={(v) => set({ ...e, clearingS: v as number })}
          {...f('clearingS')}
          editable={editable}
          testID="etu-clearing"
        />
      </Row>
      {placed.library || typesById.size === 0 ? null : (
        <T variant="small">
          Not from a library trip-unit type: its settings are edited as numbers. Choose a library trip unit in the
          device’s row to set it by switch positions.
        </T>
      )}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Thermal-magnetic

function ThermalMagneticFields({
  tm,
  editable,
  setDevice,
  fieldError,
  fieldWarning,
}: FieldsCommon & { tm: ThermalMagneticDevice }) {
  const mode = tmInstantaneousMode(tm);
  const i = tm.instantaneous ?? {};
  const setInst = (k: keyof NonNullable<ThermalMagneticDevice['instantaneous']>, v: number | string | undefined) =>
    setDevice({ ...tm, instantaneous: setField({ ...i }, k, v as never) });
  const f = (k: string) => ({ error: fieldError(`instantaneous.${k}`), warning: fieldWarning(`instantaneous.${k}`) });
  return (
    <View style={styles.fields}>
      <T variant="small">{`Rating ${num(tm.ratingA)} A; the thermal band (${tm.thermal.max.length} points) is kept as it is.`}</T>
      <Row>
        <FormField label="Instantaneous pickup" error={fieldError('instantaneous')} basis={240}>
          <SegCell
            value={mode}
            options={[
              { value: 'tolerance', label: 'Pickup ± %' },
              { value: 'range', label: 'Low–high' },
              { value: 'none', label: 'None' },
            ]}
            onChange={(v) => setDevice(withTmInstantaneousMode(tm, v))}
            size="form"
            invalid={false}
            editable={editable}
            testID="tm-inst-mode"
            accessibilityLabel="Instantaneous pickup given as"
          />
        </FormField>
      </Row>
      {mode === 'tolerance' ? (
        <Row>
          <Num
            label="Pickup"
            unit="× rating"
            value={i.pickupMultiple}
            onChange={(v) => setInst('pickupMultiple', v)}
            {...f('pickupMultiple')}
            hint={i.pickupMultiple ? `${num(i.pickupMultiple * tm.ratingA)} A` : undefined}
            editable={editable}
            testID="tm-inst-pickup"
          />
          <Num
            label="Tolerance"
            unit="± %"
            value={i.tolerancePct}
            onChange={(v) => setInst('tolerancePct', v)}
            {...f('tolerancePct')}
            editable={editable}
            testID="tm-inst-tolerance"
          />
        </Row>
      ) : mode === 'range' ? (
        <Row>
          <Num
            label="Low"
            unit="× rating"
            value={i.lowMultiple}
            onChange={(v) => setInst('lowMultiple', v)}
            {...f('lowMultiple')}
            editable={editable}
            testID="tm-inst-low"
          />
          <Num
            label="High"
            unit="× rating"
            value={i.highMultiple}
            onChange={(v) => setInst('highMultiple', v)}
            {...f('highMultiple')}
            editable={editable}
            testID="tm-inst-high"
          />
        </Row>
      ) : null}
      {mode !== 'none' ? (
        <Row>
          <FormField label="Setting name" hint="The adjustable position chosen, e.g. LO or HI (optional)" basis={160}>
            <TextCell
              value={i.setting}
              onChange={(v) => setInst('setting', v.trim() === '' ? undefined : v)}
              size="form"
              invalid={false}
              editable={editable}
              testID="tm-inst-setting"
              accessibilityLabel="Instantaneous setting name"
            />
          </FormField>
        </Row>
      ) : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Fuse

function FuseFields({
  f,
  placed,
  typesById,
  editable,
  patch,
}: {
  f: FuseDevice;
  placed: PlacedDeviceInput;
  typesById: ReadonlyMap<string, DeviceType>;
  editable: boolean;
  patch: (update: (d: PlacedDeviceInput) => PlacedDeviceInput) => void;
}) {
  const options = useMemo(
    () =>
      [...typesById.values()]
        .filter((t) => t.kind === 'fuse')
        .sort(
          (a, b) => (a.device as FuseDevice).ratingA - (b.device as FuseDevice).ratingA || a.name.localeCompare(b.name),
        )
        .map((t) => ({ value: t.id, label: t.name, detail: deviceSettingsSummary(t.device) })),
    [typesById],
  );
  return (
    <View style={styles.fuseFields}>
      <Row>
        <FormField label="Fuse from the library" basis={240}>
          <PickCell
            value={placed.library?.deviceTypeId}
            options={options}
            onChange={(v) => {
              const t = typesById.get(v);
              if (t) patch((d) => fromLibrary(d, t));
            }}
            title="Fuse from the library"
            placeholder={placed.library ? placed.library.name : 'Choose a fuse'}
            formatUnknown={() => placed.library?.name ?? 'Unknown fuse'}
            size="form"
            invalid={false}
            editable={editable}
            testID="fuse-type"
            accessibilityLabel="Fuse from the library"
          />
        </FormField>
      </Row>
      <T variant="small">{`Rating ${num(f.ratingA)} A. A fuse has no settings: choose another fuse to change its band.`}</T>
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// The band with the bus's currents

function BandBeside({
  placed,
  device,
  model,
  studyId,
}: {
  placed: PlacedDeviceInput;
  device: Device;
  model: ModelInput;
  studyId?: string;
}) {
  const debounced = useDebounced(device, 300);
  const valid = useMemo(() => {
    const r = deviceSchema.safeParse(debounced);
    return r.success ? r.data : null;
  }, [debounced]);
  const base = useBandCurves(valid);
  const busId = busOfDevice(placed, model);
  const result = useBusResult(studyId ?? '', busId ?? '', undefined, !!studyId && !!busId);
  const bus = result.data?.bus;
  // The band drawn past the bus's bolted fault current, so it meets the lines (within the plot's decade limit).
  const fromA = base.data?.fromA;
  const wantToA =
    bus && bus.status === 'ok' && fromA !== undefined
      ? Math.min(bus.boltedFaultKa * 1000 * 2, fromA * 10 ** PLOT_LIMITS.maxDecades, PLOT_LIMITS.maxA)
      : undefined;
  const extend = !!valid && !!base.data && wantToA !== undefined && wantToA > base.data.toA;
  const validJson = valid ? JSON.stringify(valid) : '';
  const extended = useQuery({
    queryKey: queryKeys.bandCurves(`${validJson}|${fromA}|${wantToA}`),
    queryFn: () => {
      if (!valid) throw new Error('No device to plot');
      return callApi(contract.calc.bandCurves, { body: { device: valid, fromA, toA: wantToA } });
    },
    enabled: extend,
    retry: false,
  });
  const curves = extend && extended.data ? extended : base;
  const verticals: TimeCurrentVertical[] = [];
  if (bus && bus.status === 'ok') {
    verticals.push({ currentA: bus.boltedFaultKa * 1000, label: 'Bolted fault', tone: 'neutral' });
    if (bus.arcingCurrentKa) {
      verticals.push({ currentA: bus.arcingCurrentKa.full * 1000, label: 'Full arcing', tone: 'full' });
      verticals.push({ currentA: bus.arcingCurrentKa.reduced * 1000, label: 'Reduced arcing', tone: 'reduced' });
    }
  }
  const label = placed.id || 'Device';
  const note = !busId
    ? 'Place the device to see the currents of its bus.'
    : !studyId
      ? `No run to take ${busId}’s currents from.`
      : result.isLoading
        ? `Reading ${busId}’s currents from the last run…`
        : bus
          ? `Lines at ${busId}’s bolted fault and arcing currents from the last run (saved model at that time); the device may carry only part of them.`
          : `No results for ${busId} yet: run the study to see its bolted fault and arcing currents here.`;
  return (
    <View style={styles.band} testID="device-settings-band">
      <View style={styles.bandHead}>
        <T variant="label">BAND</T>
        <T variant="small" testID="device-settings-band-note" style={bus ? styles.bandNote : styles.bandNoteNone}>
          {note}
        </T>
      </View>
      {!valid ? (
        <T variant="small" style={styles.bandWaiting}>
          The band is drawn once the settings are complete.
        </T>
      ) : curves.error ? (
        <Notice tone="error">{serverErrors(curves.error).message}</Notice>
      ) : (
        <TimeCurrentPlot
          testID="device-settings-plot"
          series={curves.data ? [{ id: label, label, min: curves.data.min, max: curves.data.max }] : []}
          currentUnit="A"
          verticals={verticals}
          emptyMessage={curves.isLoading ? 'Drawing the band…' : undefined}
        />
      )}
      <T variant="small" style={styles.footnote}>
        Settings here change this placed device only; the library type stays as it is.
      </T>
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: space.md },
  head: { flexDirection: 'row', alignItems: 'flex-start', gap: space.sm },
  headText: { flex: 1, gap: 2 },
  warningText: { color: colors.caution },
  problem: { color: colors.danger, fontSize: 15 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  noDevice: { gap: space.sm },
  fields: { gap: space.md },
  errorText: { color: colors.danger },
  fuseFields: { gap: space.sm },
  band: { gap: space.sm },
  bandHead: {
    borderTopWidth: 1,
    borderTopColor: colors.line,
    paddingTop: space.sm,
    gap: 2,
  },
  bandNote: { color: colors.inkSoft },
  /** No results for the bus yet. */
  bandNoteNone: { color: colors.muted },
  bandWaiting: { color: colors.muted },
  footnote: { fontFamily: fonts.text, color: colors.muted },
});
