/** Protective device fields. */
import { Pressable, StyleSheet, View } from 'react-native';
import { genericNoteSentence, type DeviceType } from '../../../shared/schemas/deviceLibrary';
import type { Device } from '../../../shared/schemas/device';
import { colors, fonts } from '../../theme';
import { T } from '../../ui';
import { PickCell, SegCell } from '../controls';
import { deviceKindLabel, deviceSettingsSummary, type PlacedDeviceInput } from '../summaries';
import { modifiedFrom } from '../devices/deviceEdit';
import { type Column, idColumn, nameColumn } from './shared';

/** The location picker's value: `branch:TX-1` or `source:UTIL-1`. */
export function locationValue(d: PlacedDeviceInput): string {
  if (d.branch !== undefined) return d.branch === '' ? '' : `branch:${d.branch}`;
  if (d.source !== undefined) return d.source === '' ? '' : `source:${d.source}`;
  return '';
}

/** The library type's device differs from the one stored in the model (the type was edited since). */
export function libraryChanged(d: PlacedDeviceInput, t: DeviceType | undefined): boolean {
  if (!t || !d.device) return false;
  // A trip unit set to other positions of its type than the library's own: its device is resolved from those
  // positions, so only the positions' own existence can be checked here.
  if (t.definition.kind === 'electronic' && d.library?.positions) {
    const own = t.definition.positions;
    if (JSON.stringify(d.library.positions) !== JSON.stringify(own)) {
      const settings = t.definition.tripType.settings as Record<
        string,
        { positions: Record<string, number> } | undefined
      >;
      return Object.entries(d.library.positions).some(([k, v]) => !settings[k] || !(v in settings[k].positions));
    }
  }
  return JSON.stringify(t.device) !== JSON.stringify(d.device);
}

export function fromLibrary(d: PlacedDeviceInput, t: DeviceType): PlacedDeviceInput {
  return {
    ...d,
    device: t.device,
    library: {
      deviceTypeId: t.id,
      name: t.name,
      ...(t.definition.kind === 'electronic' ? { positions: t.definition.positions } : {}),
    },
  };
}

export const DEVICE_COLUMNS: Column<PlacedDeviceInput>[] = [
  idColumn(120),
  nameColumn(150),
  {
    key: 'location',
    label: 'Location',
    width: 140,
    basis: 170,
    issueKeys: ['branch', 'source'],
    hint: () => 'A branch end, or a source or motor',
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => (
      <PickCell
        value={locationValue(e)}
        options={ctx.locationOptions}
        title="Where the device sits"
        placeholder="Choose"
        formatUnknown={(v) => v.replace(/^(branch|source):/, '')}
        unknownHint="unknown"
        onChange={(v) =>
          patch((d) => {
            const [kind, id] = [v.slice(0, v.indexOf(':')), v.slice(v.indexOf(':') + 1)];
            const { branch: _b, source: _s, end, ...rest } = d;
            return kind === 'branch' ? { ...rest, branch: id, end: end ?? 'from' } : { ...rest, source: id };
          })
        }
        size={size}
        invalid={invalid}
        editable={editable}
        testID={testID}
        accessibilityLabel={label}
      />
    ),
  },
  {
    key: 'end',
    label: 'End',
    width: 120,
    basis: 200,
    issueKeys: ['end'],
    applies: (d) => d.branch !== undefined,
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => {
      const buses = e.branch ? ctx.branchBuses.get(e.branch) : undefined;
      const long = size === 'form' && buses;
      const at = buses && e.end ? buses[e.end] : undefined;
      return (
        <View style={styles.end}>
          <SegCell
            value={e.end}
            options={[
              { value: 'from', label: long ? `From · ${buses.from}` : 'From' },
              { value: 'to', label: long ? `To · ${buses.to}` : 'To' },
            ]}
            onChange={(v) => patch((d) => ({ ...d, end: v }))}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={label}
          />
          {size === 'cell' && at ? (
            <T numberOfLines={1} style={styles.endBus}>
              {`at ${at}`}
            </T>
          ) : null}
        </View>
      );
    },
  },
  {
    key: 'type',
    label: 'Device type and settings',
    formLabel: 'Device type',
    width: 300,
    basis: 300,
    issueKeys: ['device', 'library'],
    render: ({ e, size, invalid, editable, patch, ctx, testID, label }) => {
      const device = e.device as Device | undefined;
      const t = e.library ? ctx.typesById.get(e.library.deviceTypeId) : undefined;
      const changed = libraryChanged(e, t);
      return (
        <View style={styles.type}>
          <PickCell
            value={e.library?.deviceTypeId}
            options={ctx.typeOptions}
            title="Device type from the library"
            placeholder={
              e.device
                ? modifiedFrom(e)
                  ? `Modified from ${modifiedFrom(e)}`
                  : 'Set in the model (not from the library)'
                : 'Choose from the library'
            }
            formatUnknown={() => e.library?.name ?? 'Unknown type'}
            unknownHint="not in the library"
            onChange={(v) => {
              const type = ctx.typesById.get(v);
              if (type) patch((d) => fromLibrary(d, type));
            }}
            size={size}
            invalid={invalid}
            editable={editable}
            testID={testID}
            accessibilityLabel={label}
          />
          {device ? (
            <T numberOfLines={size === 'cell' ? 2 : undefined} style={styles.typeSummary} testID={`${testID}-summary`}>
              <T style={styles.typeKind}>{deviceKindLabel(device)}</T>
              {`  ${deviceSettingsSummary(device)}`}
            </T>
          ) : null}
          {t?.genericNote ? (
            <T numberOfLines={size === 'cell' ? 1 : undefined} style={styles.typeGeneric} testID={`${testID}-generic`}>
              {genericNoteSentence(t.genericNote)}
            </T>
          ) : null}
          {ctx.openDevice ? (
            <Pressable
              accessibilityRole="button"
              accessibilityLabel={`${editable ? 'Edit' : 'View'} the settings of ${e.id || 'this device'}`}
              onPress={() => ctx.openDevice?.(e)}
              testID={`${testID}-settings`}
              style={styles.settingsLink}
            >
              <T style={styles.settingsLinkText}>{editable ? 'Edit settings' : 'View settings'}</T>
            </Pressable>
          ) : null}
          {changed ? (
            <Pressable
              accessibilityRole="button"
              disabled={!editable}
              onPress={() => t && patch((d) => fromLibrary(d, t))}
              testID={`${testID}-update`}
              style={styles.update}
            >
              <T style={[styles.updateText, editable ? styles.updateTextLink : null]}>
                {editable ? 'Library type changed since: use its current settings' : 'Library type changed since'}
              </T>
            </Pressable>
          ) : null}
        </View>
      );
    },
  },
];

const styles = StyleSheet.create({
  end: { gap: 2 },
  endBus: { fontSize: 12, lineHeight: 16, color: colors.muted, textAlign: 'center' },
  type: { gap: 3 },
  typeSummary: { fontSize: 13, lineHeight: 18, color: colors.inkSoft, paddingHorizontal: 2 },
  typeKind: { fontSize: 13, fontFamily: fonts.textMedium, color: colors.ink },
  typeGeneric: { fontSize: 13, lineHeight: 18, color: colors.caution, paddingHorizontal: 2 },
  settingsLink: { paddingHorizontal: 2, minHeight: 28, justifyContent: 'center' },
  settingsLinkText: {
    fontSize: 14,
    color: colors.accent,
    fontFamily: fonts.textMedium,
    textDecorationLine: 'underline',
  },
  update: { paddingHorizontal: 2 },
  updateText: { fontSize: 13, color: colors.caution, textDecorationLine: 'none' },
  /** Underlined where it can be pressed. */
  updateTextLink: { textDecorationLine: 'underline' },
});
