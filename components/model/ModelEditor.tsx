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
import { useCallback } from 'react';
import { useLayout } from '../../hooks/useLayout';
import { View } from 'react-native';
import { space } from '../theme';
import { CollectionSection } from './editor/CollectionSection';
import { GeneralSection } from './editor/GeneralSection';
import { IssueSummary } from './editor/IssueSummary';
import { ScenariosSection } from './editor/ScenariosSection';
import { SectionTabs } from './editor/SectionTabs';
import { UndoToast } from './editor/UndoBar';
import { useModelEditorState } from './editor/useModelEditorState';
import { useSectionContext } from './editor/useSectionContext';

export interface ModelEditorProps {
  model: ModelInput;
  onChange: (m: ModelInput) => void;
  issues: ModelIssue[];
  editable: boolean;
  deviceTypes: DeviceType[];
  /** Optional: open this element (e.g. chosen in the system tree). A new object each time jumps again. */
  focus?: { collection: string; index: number } | null;
}

export function ModelEditor({ model, onChange, issues, editable, deviceTypes, focus: focusRequest }: ModelEditorProps) {
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

  const ctx = useSectionContext(model, section, deviceTypes);
  const onScenarioDeleted = useCallback(
    (text: string, before: ModelInput, after: ModelInput) => setUndo({ text, before, after }),
    [setUndo],
  );
  const showUndo = undo !== null && undo.after === model;

  return (
    <View style={{ gap: space.lg }} testID="model-editor">
      <IssueSummary grouped={grouped} model={model} onJump={jump} />
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
        <CollectionSection
          key={section}
          collection={section}
          model={model}
          grouped={grouped}
          ctx={ctx}
          editable={editable}
          wide={wide}
          expanded={expanded}
          focus={focus}
          actions={actions}
          filter={filter}
          setFilter={setFilter}
          onAdd={add}
        />
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
