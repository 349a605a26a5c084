/**
 * The system model editor (controlled): sections for buses, sources, transformers, cables, motors, ties, devices
 * and the operating scenarios; an editable table per section on wide screens, one collapsible card per element on a
 * phone. Every `ModelIssue` is shown beside its element and field, and listed at the top (tap to jump there).
 *
 * Kept fast with a few hundred elements: only the open section is rendered, rows are memoized and receive stable
 * callbacks, inputs keep their text locally, and what a row needs from the rest of the model (bus lists, library
 * types) is rebuilt only when that part changes.
 */
import type { DeviceType } from '../../shared/schemas/deviceLibrary';
import type { ModelInput, ModelIssue } from '../../shared/schemas/model';
import type { ModelWarning } from '../../shared/schemas/modelWarnings';
import { useCallback, useMemo, useState, type ReactNode } from 'react';
import { useLayout } from '../../hooks/useLayout';
import { StyleSheet, View } from 'react-native';
import { space } from '../theme';
import { CollectionSection } from './editor/CollectionSection';
import { GeneralSection } from './editor/GeneralSection';
import { IssueSummary } from './editor/IssueSummary';
import { ScenariosSection } from './editor/ScenariosSection';
import { SectionTabs } from './editor/SectionTabs';
import { UndoToast } from './editor/UndoBar';
import { useModelEditorState } from './editor/useModelEditorState';
import { useSectionContext } from './editor/useSectionContext';
import { DeviceSettingsPanel } from './devices/DeviceSettingsPanel';
import { findDevice } from './devices/deviceEdit';
import { elementKey, groupIssues, type PlacedDeviceInput } from './summaries';
import { NO_ISSUES } from './editor/types';

export interface ModelEditorProps {
  model: ModelInput;
  onChange: (m: ModelInput) => void;
  issues: ModelIssue[];
  editable: boolean;
  deviceTypes: DeviceType[];
  /** Optional: open this element (e.g. chosen in the system tree). A new object each time jumps again. */
  focus?: { collection: string; index: number } | null;
  /** Plausibility warnings (never blocking): shown beside their field and as "Worth checking" at the top. */
  warnings?: readonly ModelWarning[];
  /** The study whose last run gives a device's bus currents in the device settings editor. */
  studyId?: string;
  /** Optional: open the settings and band of this placed device (e.g. tapped on the one-line). A new object each time opens again. */
  openDeviceRequest?: { id: string } | null;
}

const NO_WARNINGS: readonly ModelWarning[] = [];

export function ModelEditor({
  model,
  onChange,
  issues,
  editable,
  deviceTypes,
  focus: focusRequest,
  warnings = NO_WARNINGS,
  studyId,
  openDeviceRequest,
}: ModelEditorProps) {
  const { wide } = useLayout();
  const {
    section,
    setSection,
    expanded,
    focus,
    filter,
    setFilter,
    undo,
    setUndo,
    commit,
    latest,
    actions,
    add,
    grouped,
    jump,
  } = useModelEditorState(model, onChange, issues, focusRequest);

  const sectionCtx = useSectionContext(model, section, deviceTypes);
  // The device settings editor: the device by index, and its id to follow it when the list changes.
  const [deviceOpen, setDeviceOpen] = useState<{ index: number; id: string; nonce: number } | null>(null);
  const openDevice = useCallback(
    (element: object) => {
      const index = (latest().devices ?? []).indexOf(element as PlacedDeviceInput);
      const id = (element as PlacedDeviceInput).id;
      // A new nonce on each open, so the panel scrolls into view again.
      if (index >= 0) setDeviceOpen((o) => ({ index, id, nonce: (o?.nonce ?? 0) + 1 }));
    },
    [latest],
  );
  // A request from outside opens the devices section and that device's settings, once per request.
  const [seenOpen, setSeenOpen] = useState<{ id: string } | null | undefined>(null);
  if (openDeviceRequest !== seenOpen) {
    setSeenOpen(openDeviceRequest);
    const req = openDeviceRequest;
    const index = req ? (model.devices ?? []).findIndex((d) => d.id === req.id) : -1;
    if (req && index >= 0) {
      setSection('devices');
      setFilter('');
      setDeviceOpen((o) => ({ index, id: req.id, nonce: (o?.nonce ?? 0) + 1 }));
    }
  }
  const ctx = useMemo(
    () => (section === 'devices' ? { ...sectionCtx, openDevice } : sectionCtx),
    [sectionCtx, section, openDevice],
  );
  const groupedWarnings = useMemo(
    () => groupIssues(warnings as unknown as readonly ModelIssue[], model),
    [warnings, model],
  );
  const deviceIndex = deviceOpen ? findDevice(model, deviceOpen.index, deviceOpen.id) : -1;
  const patchDevice = useCallback(
    (update: (d: PlacedDeviceInput) => PlacedDeviceInput) => {
      if (deviceIndex >= 0) actions.patch('devices', deviceIndex, update as never);
    },
    [actions, deviceIndex],
  );
  const devicePanel =
    section === 'devices' && deviceIndex >= 0 ? (
      <DeviceSettingsPanel
        model={model}
        index={deviceIndex}
        typesById={sectionCtx.typesById}
        issues={grouped.byElement.get(elementKey('devices', deviceIndex)) ?? NO_ISSUES}
        warnings={groupedWarnings.byElement.get(elementKey('devices', deviceIndex)) ?? NO_ISSUES}
        editable={editable}
        studyId={studyId}
        patch={patchDevice}
        openNonce={deviceOpen?.nonce ?? 0}
        onClose={() => setDeviceOpen(null)}
      />
    ) : null;
  const onScenarioDeleted = useCallback(
    (text: string, before: ModelInput, after: ModelInput) => setUndo({ text, before, after }),
    [setUndo],
  );
  const showUndo = undo !== null && undo.after === model;

  return (
    <View style={styles.editor} testID="model-editor">
      <IssueSummary grouped={grouped} warnings={groupedWarnings} model={model} onJump={jump} />
      <SectionTabs
        section={section}
        onChange={(s) => {
          setSection(s);
          setFilter('');
        }}
        model={model}
        grouped={grouped}
        wide={wide}
      />
      {section === 'general' ? (
        <GeneralSection model={model} commit={commit} editable={editable} grouped={grouped} />
      ) : section === 'scenarios' ? (
        <ScenariosSection
          model={model}
          grouped={grouped}
          editable={editable}
          wide={wide}
          commit={commit}
          latest={latest}
          focus={focus}
          onDeleted={onScenarioDeleted}
        />
      ) : (
        <DeviceLayout wide={wide} panel={devicePanel}>
          <CollectionSection
            key={section}
            collection={section}
            model={model}
            grouped={grouped}
            warnings={groupedWarnings}
            ctx={ctx}
            editable={editable}
            wide={wide}
            expanded={expanded}
            focus={focus}
            actions={actions}
            filter={filter}
            setFilter={setFilter}
            onAdd={add}
            stackHeader={wide && !!devicePanel}
          />
        </DeviceLayout>
      )}
      {showUndo ? (
        <UndoToast
          text={undo.text}
          onUndo={() => {
            setUndo(null);
            commit(undo.before);
          }}
          onDismiss={() => setUndo(null)}
        />
      ) : null}
    </View>
  );
}

/** The device settings editor beside the table (wide) or above the cards, full width (phone). */
function DeviceLayout({ wide, panel, children }: { wide: boolean; panel: ReactNode; children: ReactNode }) {
  if (!panel) return <>{children}</>;
  if (!wide) {
    return (
      <View style={styles.stacked}>
        {panel}
        {children}
      </View>
    );
  }
  return (
    <View style={styles.beside}>
      <View style={styles.besideMain}>{children}</View>
      <View style={styles.besidePanel}>{panel}</View>
    </View>
  );
}

const styles = StyleSheet.create({
  editor: { gap: space.lg },
  stacked: { gap: space.lg },
  beside: { flexDirection: 'row', alignItems: 'flex-start', gap: space.lg },
  besideMain: { flex: 1, minWidth: 0 },
  besidePanel: { width: 420, flexShrink: 0 },
});
