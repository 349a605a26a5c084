/**
 * The system model editor (controlled): sections for buses, sources, transformers, cables, motors, ties and
 * devices; an editable table per section on wide screens, one collapsible card per element on a phone. Every
 * `ModelIssue` is shown beside its element and field, and listed at the top (tap to jump there).
 *
 * Kept fast with a few hundred elements: only the open section is rendered, rows are memoized and receive stable
 * callbacks, inputs keep their text locally, and what a row needs from the rest of the model (bus lists, library
 * types) is rebuilt only when that part changes.
 */
import React, { memo, useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { Platform, Pressable, ScrollView, TextInput, View, type ViewStyle } from 'react-native';
import type { DeviceType } from '../../shared/schemas/deviceLibrary';
import { DEVICE_KIND_LABELS } from '../../shared/schemas/deviceLibrary';
import type { ModelInput, ModelIssue } from '../../shared/schemas/model';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Card, Choice, T } from '../ui';
import { COLUMNS, EMPTY_CONTEXT, NotApplicable, type Column, type EditorContext } from './columns';
import { FormField, Icon, IconButton, NumCell, TextCell, type PickOption } from './controls';
import {
  addElement,
  countReferences,
  deleteElement,
  duplicateElement,
  newElement,
  renameElement,
  shiftKeys,
  updateElement,
  withField,
  type NewVariant,
} from './edit';
import {
  COLLECTION_LABELS,
  COLLECTIONS,
  deviceSettingsSummary,
  elementKey,
  elementSummary,
  fieldLabel,
  groupIssues,
  isCollection,
  issueMessage,
  issuePlace,
  itemsOf,
  matchField,
  num,
  problemCount,
  searchText,
  type AnyElement,
  type CollectionKey,
  type LocatedIssue,
} from './summaries';

type Section = CollectionKey | 'general';

export interface ModelEditorProps {
  model: ModelInput;
  onChange: (m: ModelInput) => void;
  issues: ModelIssue[];
  editable: boolean;
  deviceTypes: DeviceType[];
  /** Optional: open this element (e.g. chosen in the system tree). A new object each time jumps again. */
  focus?: { collection: string; index: number } | null;
}

const NO_ISSUES: readonly LocatedIssue[] = [];

const SECTION_NOTES: Record<Section, string> = {
  general: 'The study as a whole.',
  buses:
    'Each bus with equipment gets a label. The equipment class gives the typical electrode configuration, gap, enclosure and working distance (IEEE 1584-2018); fill a field only to override it.',
  sources:
    'Utility services (available short circuit and X/R at the bus) and generators (rating and subtransient reactance).',
  transformers: 'From the primary bus to the secondary bus; %Z on the transformer rating.',
  cables: 'Conductor size, material and conduit (NEC Chapter 9 Table 9), or R and X per km of one conductor.',
  motors: 'Induction motors that feed the fault: rating in hp or kVA.',
  ties: 'Bus ties and switches of negligible impedance; a closed tie joins two buses into one node.',
  devices:
    'Each protective device sits at one end of a transformer, cable or tie, or on a source or motor. Its settings come from the device library.',
};

interface Focus {
  key: string;
  nonce: number;
}

/** Callbacks shared by every row: stable for the editor's lifetime (they read the latest model from a ref). */
interface RowActions {
  patch: (collection: CollectionKey, index: number, update: (e: AnyElement) => AnyElement) => void;
  rename: (collection: CollectionKey, index: number, id: string) => void;
  duplicate: (collection: CollectionKey, index: number) => void;
  remove: (collection: CollectionKey, index: number) => void;
  toggle: (key: string) => void;
}

export function ModelEditor({ model, onChange, issues, editable, deviceTypes, focus: focusRequest }: ModelEditorProps) {
  const { wide } = useLayout();
  const [section, setSection] = useState<Section>('buses');
  const [expanded, setExpanded] = useState<Set<string>>(() => new Set());
  const [focus, setFocus] = useState<Focus | null>(null);
  const [filter, setFilter] = useState('');
  const [undo, setUndo] = useState<{ text: string; before: ModelInput; after: ModelInput } | null>(null);

  // The latest model and callback for the stable row actions below (synced after each render, before any event).
  const modelRef = useRef(model);
  const onChangeRef = useRef(onChange);
  useLayoutEffect(() => {
    modelRef.current = model;
    onChangeRef.current = onChange;
  });
  const commit = useCallback((next: ModelInput) => {
    if (next === modelRef.current) return;
    modelRef.current = next;
    onChangeRef.current(next);
  }, []);

  const focusOn = useCallback((key: string, expand: boolean) => {
    // A new nonce each time, so asking for the same element again scrolls to it again.
    setFocus((f) => ({ key, nonce: (f?.nonce ?? 0) + 1 }));
    if (expand) setExpanded((s) => (s.has(key) ? s : new Set(s).add(key)));
  }, []);

  const actions = useMemo<RowActions>(
    () => ({
      patch: (collection, index, update) => commit(updateElement(modelRef.current, collection, index, update)),
      rename: (collection, index, id) => commit(renameElement(modelRef.current, collection, index, id.trim())),
      duplicate: (collection, index) => {
        const r = duplicateElement(modelRef.current, collection, index);
        setExpanded((s) => shiftKeys(s, collection, r.index, 'insert'));
        commit(r.model);
        focusOn(elementKey(collection, r.index), true);
      },
      remove: (collection, index) => {
        const before = modelRef.current;
        const element = itemsOf(before, collection)[index];
        if (!element) return;
        const after = deleteElement(before, collection, index);
        const refs = countReferences(after, element.id);
        setExpanded((s) => shiftKeys(s, collection, index, 'delete'));
        setFocus(null);
        setUndo({
          text: `Deleted ${COLLECTION_LABELS[collection].singular} ${element.id || `#${index + 1}`}${refs ? ` — ${refs} reference${refs === 1 ? '' : 's'} to it now point nowhere` : ''}`,
          before,
          after,
        });
        commit(after);
      },
      toggle: (key) =>
        setExpanded((s) => {
          const next = new Set(s);
          if (next.has(key)) next.delete(key);
          else next.add(key);
          return next;
        }),
    }),
    [commit, focusOn],
  );

  const add = (collection: CollectionKey, variant?: NewVariant) => {
    const r = addElement(modelRef.current, collection, newElement(modelRef.current, collection, variant));
    setFilter('');
    commit(r.model);
    focusOn(elementKey(collection, r.index), true);
  };

  // Issues are grouped against the model they may point into (indexes resolved to the current elements).
  const grouped = useMemo(() => groupIssues(issues, model), [issues, model]);

  const jump = useCallback(
    (li: LocatedIssue) => {
      if (li.collection) setSection(li.collection);
      else setSection('general');
      setFilter('');
      if (li.key) focusOn(li.key, true);
    },
    [focusOn],
  );

  // A focus request from outside (the system tree) opens its element once per request.
  const [seenRequest, setSeenRequest] = useState(focusRequest);
  if (focusRequest !== seenRequest) {
    setSeenRequest(focusRequest);
    if (focusRequest && isCollection(focusRequest.collection)) {
      setSection(focusRequest.collection);
      setFilter('');
      focusOn(elementKey(focusRequest.collection, focusRequest.index), true);
    }
  }

  const ctx = useSectionContext(model, section, deviceTypes);
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

// ---------------------------------------------------------------------------------------------
// What the rows of a section need from the rest of the model, rebuilt only when that part changes

function useSectionContext(model: ModelInput, section: Section, deviceTypes: DeviceType[]): EditorContext {
  const buses = model.buses;
  const busSig = buses.map((b) => `${b.id}\u0001${b.name ?? ''}\u0001${b.nominalKv}`).join('\u0002');
  const bus = useMemo(() => {
    const options: PickOption[] = buses.map((b) => ({
      value: b.id,
      label: b.id,
      detail: [b.name, `${num(b.nominalKv)} kV`].filter(Boolean).join(' · '),
    }));
    const kv = new Map<string, number>();
    for (const b of buses) if (!kv.has(b.id) && Number.isFinite(b.nominalKv)) kv.set(b.id, b.nominalKv);
    return { options, kv };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when the bus ids, names or voltages change
  }, [busSig]);

  const branches = [
    ...(model.transformers ?? []).map((t) => ['transformers', t.id, t.fromBus, t.toBus, `${num(t.kva)} kVA`] as const),
    ...(model.cables ?? []).map((c) => ['cables', c.id, c.fromBus, c.toBus, `${num(c.lengthM)} m`] as const),
    ...(model.ties ?? []).map(
      (t) => ['ties', t.id, t.fromBus, t.toBus, t.closed === false ? 'open' : 'closed'] as const,
    ),
  ];
  const injections = [
    ...(model.sources ?? []).map((s) => ['Sources', s.id, `${s.kind} at ${s.bus}`] as const),
    ...(model.motors ?? []).map(
      (m) => ['Motors', m.id, `${m.hp !== undefined ? `${num(m.hp)} hp` : `${num(m.kva)} kVA`} at ${m.bus}`] as const,
    ),
  ];
  const locSig = section === 'devices' ? JSON.stringify([branches, injections]) : '';
  const location = useMemo(() => {
    const options: PickOption[] = [];
    const ends = new Map<string, { from: string; to: string }>();
    const groupName = { transformers: 'Transformers', cables: 'Cables', ties: 'Ties' } as const;
    for (const [c, id, from, to, what] of branches) {
      options.push({ value: `branch:${id}`, label: id, detail: `${from} → ${to} · ${what}`, group: groupName[c] });
      if (!ends.has(id)) ends.set(id, { from, to });
    }
    for (const [group, id, what] of injections) options.push({ value: `source:${id}`, label: id, detail: what, group });
    return { options, ends };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when branches, sources or motors change
  }, [locSig]);

  const types = useMemo(() => {
    const byKind = [...deviceTypes].sort((a, b) => a.kind.localeCompare(b.kind) || a.name.localeCompare(b.name));
    const options: PickOption[] = byKind.map((t) => ({
      value: t.id,
      label: t.name,
      detail: deviceSettingsSummary(t.device),
      group: DEVICE_KIND_LABELS[t.kind],
    }));
    return { options, byId: new Map(deviceTypes.map((t) => [t.id, t])) };
  }, [deviceTypes]);

  // Devices at each bus's end of a branch: its possible main devices. Which branch feeds a bus depends on the fault,
  // so every branch end at the bus counts here (a superset of the mains the study finds).
  const mainSig =
    section === 'buses'
      ? (model.devices ?? [])
          .filter((d) => d.branch && d.end)
          .map((d) => `${d.id}\u0001${d.branch}\u0001${d.end}`)
          .join('\u0002') + JSON.stringify(branches.map((b) => [b[1], b[2], b[3]]))
      : '';
  const busMains = useMemo(() => {
    const out = new Map<string, string[]>();
    if (!mainSig) return out;
    const ends = new Map(branches.map((b) => [b[1], { from: b[2], to: b[3] }]));
    for (const d of model.devices ?? []) {
      const e = d.branch ? ends.get(d.branch) : undefined;
      const at = e && d.end ? e[d.end] : undefined;
      if (at) out.set(at, [...(out.get(at) ?? []), d.id]);
    }
    return out;
    // eslint-disable-next-line react-hooks/exhaustive-deps -- rebuilt when branch-end devices or branch ends change
  }, [mainSig]);

  const usesBuses = section !== 'general' && section !== 'buses' && section !== 'devices';
  const isDevices = section === 'devices';
  // Each part only where its section uses it, so the other sections' rows do not re-render.
  const busPart = usesBuses ? bus : null;
  const locationPart = isDevices ? location : null;
  const typesPart = isDevices ? types : null;
  const mainsPart = section === 'buses' ? busMains : null;
  return useMemo<EditorContext>(
    () => ({
      ...EMPTY_CONTEXT,
      ...(busPart ? { busOptions: busPart.options, busKv: busPart.kv } : {}),
      ...(mainsPart ? { busMains: mainsPart } : {}),
      ...(locationPart ? { locationOptions: locationPart.options, branchBuses: locationPart.ends } : {}),
      ...(typesPart ? { typeOptions: typesPart.options, typesById: typesPart.byId } : {}),
    }),
    [busPart, locationPart, typesPart, mainsPart],
  );
}

// ---------------------------------------------------------------------------------------------
// Problems at the top

const SUMMARY_SHOWN = 5;

const IssueSummary = memo(function IssueSummary({
  grouped,
  model,
  onJump,
}: {
  grouped: ReturnType<typeof groupIssues>;
  model: ModelInput;
  onJump: (li: LocatedIssue) => void;
}) {
  const [all, setAll] = useState(false);
  const n = grouped.all.length;
  if (n === 0) {
    return (
      <View
        testID="model-issues-none"
        style={{
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          paddingHorizontal: space.md,
          paddingVertical: space.sm,
          backgroundColor: colors.okSoft,
          borderRadius: radius.sm,
        }}
      >
        <Icon name="check" size={18} color={colors.ok} />
        <T style={{ color: colors.ok, fontSize: 15 }}>No problems found in the model.</T>
      </View>
    );
  }
  const shown = all ? grouped.all : grouped.all.slice(0, SUMMARY_SHOWN);
  return (
    <View
      testID="model-issues"
      accessibilityRole="alert"
      style={{
        backgroundColor: colors.dangerSoft,
        borderLeftWidth: 4,
        borderLeftColor: colors.danger,
        borderRadius: radius.sm,
        paddingVertical: space.sm,
        paddingHorizontal: space.md,
        gap: 2,
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, paddingVertical: space.xs }}>
        <Icon name="alert" size={20} color={colors.danger} />
        <T variant="subheading" style={{ color: colors.danger }} testID="model-issues-count">
          {problemCount(n)}
        </T>
        <T variant="small" style={{ color: colors.danger, flexShrink: 1 }}>
          — tap one to go to it
        </T>
      </View>
      {shown.map((li, i) => (
        <Pressable
          key={i}
          accessibilityRole="link"
          onPress={() => onJump(li)}
          testID={`model-issue-${i}`}
          style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => ({
            minHeight: 40,
            justifyContent: 'center',
            paddingVertical: 4,
            paddingHorizontal: space.sm,
            marginHorizontal: -space.sm,
            borderRadius: radius.sm,
            backgroundColor: pressed || hovered ? 'rgba(155,28,28,0.08)' : 'transparent',
          })}
        >
          <T style={{ fontSize: 15, lineHeight: 21, color: colors.ink }}>
            <T style={{ fontFamily: fonts.textBold, fontSize: 15, color: colors.danger }}>{issuePlace(li, model)}</T>
            {`  ${issueMessage(li.issue)}`}
          </T>
        </Pressable>
      ))}
      {n > SUMMARY_SHOWN ? (
        <Pressable
          accessibilityRole="button"
          onPress={() => setAll((v) => !v)}
          style={{ minHeight: 40, justifyContent: 'center' }}
          testID="model-issues-more"
        >
          <T
            style={{
              color: colors.danger,
              fontFamily: fonts.textMedium,
              textDecorationLine: 'underline',
              fontSize: 15,
            }}
          >
            {all ? 'Show fewer' : `Show all ${n}`}
          </T>
        </Pressable>
      ) : null}
    </View>
  );
});

// ---------------------------------------------------------------------------------------------
// Section selector

const SECTIONS: Section[] = [...COLLECTIONS, 'general'];

function SectionTabs({
  section,
  onChange,
  model,
  grouped,
  wide,
}: {
  section: Section;
  onChange: (s: Section) => void;
  model: ModelInput;
  grouped: ReturnType<typeof groupIssues>;
  wide: boolean;
}) {
  // On a phone the tabs scroll sideways: keep the open one in view (e.g. after a jump to a problem).
  const refs = useRef(new Map<Section, View | null>());
  useEffect(() => {
    if (wide || Platform.OS !== 'web') return;
    const node = refs.current.get(section) as unknown as { scrollIntoView?: (o: object) => void } | null | undefined;
    node?.scrollIntoView?.({ inline: 'nearest', block: 'nearest' });
  }, [section, wide]);
  const tabs = SECTIONS.map((s) => {
    const count = s === 'general' ? undefined : itemsOf(model, s).length;
    const problems = s === 'general' ? grouped.general.filter((g) => !g.collection).length : grouped.byCollection[s];
    const on = s === section;
    return (
      <Pressable
        key={s}
        ref={(node) => {
          refs.current.set(s, node);
        }}
        accessibilityRole="tab"
        aria-selected={on}
        onPress={() => onChange(s)}
        testID={`model-section-${s}`}
        style={({ hovered }: { pressed: boolean; hovered?: boolean }) => ({
          minHeight: touch.min,
          paddingHorizontal: space.md,
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          borderRadius: radius.sm,
          borderWidth: 1.5,
          borderColor: on ? colors.accent : colors.line,
          backgroundColor: on ? colors.accentSoft : hovered ? colors.canvas : colors.surface,
        })}
      >
        <T style={{ fontFamily: on ? fonts.textBold : fonts.textMedium, fontSize: 15, color: colors.ink }}>
          {s === 'general' ? 'General' : COLLECTION_LABELS[s].plural}
        </T>
        {count !== undefined ? (
          <T style={{ fontFamily: fonts.numbers, fontSize: 14, color: on ? colors.accent : colors.muted }}>{count}</T>
        ) : null}
        {problems ? (
          <View
            accessibilityLabel={problemCount(problems)}
            style={{
              minWidth: 20,
              height: 20,
              borderRadius: 10,
              paddingHorizontal: 5,
              backgroundColor: colors.danger,
              alignItems: 'center',
              justifyContent: 'center',
            }}
          >
            <T style={{ color: '#FFFFFF', fontFamily: fonts.numbersBold, fontSize: 12, lineHeight: 16 }}>{problems}</T>
          </View>
        ) : null}
      </Pressable>
    );
  });
  if (wide) {
    return (
      <View accessibilityRole="tablist" style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        {tabs}
      </View>
    );
  }
  return (
    <ScrollView
      horizontal
      showsHorizontalScrollIndicator={false}
      accessibilityRole="tablist"
      contentContainerStyle={{ gap: space.sm, paddingRight: space.lg }}
      style={{ marginRight: -space.lg }}
    >
      {tabs}
    </ScrollView>
  );
}

// ---------------------------------------------------------------------------------------------
// General (the study as a whole)

function GeneralSection({
  model,
  commit,
  editable,
  grouped,
}: {
  model: ModelInput;
  commit: (m: ModelInput) => void;
  editable: boolean;
  grouped: ReturnType<typeof groupIssues>;
}) {
  const errorOf = (field: string) => {
    const li = grouped.general.find((g) => !g.collection && g.field === field);
    return li ? issueMessage(li.issue) : undefined;
  };
  const others = grouped.general.filter(
    (g) => !g.collection && !['name', 'frequencyHz', 'prefaultPu'].includes(g.field ?? ''),
  );
  return (
    <Card testID="model-general">
      <T variant="small">{SECTION_NOTES.general}</T>
      {others.map((li, i) => (
        <T key={i} style={{ color: colors.danger, fontSize: 15 }}>
          {`${fieldLabel(li.field) || 'Model'}: ${issueMessage(li.issue)}`}
        </T>
      ))}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <FormField label="Study name" error={errorOf('name')} basis={260}>
          <TextCell
            value={model.name}
            onChange={(v) => commit(withField(model, 'name', v === '' ? undefined : v))}
            size="form"
            editable={editable}
            placeholder="Optional"
            accessibilityLabel="Study name"
            testID="model-name"
          />
        </FormField>
        <FormField label="Pre-fault voltage" unit="pu" error={errorOf('prefaultPu')} hint="Empty: 1.0 pu" basis={160}>
          <NumCell
            value={model.prefaultPu}
            onChange={(v) => commit(withField(model, 'prefaultPu', v))}
            size="form"
            editable={editable}
            placeholder="1.0"
            accessibilityLabel="Pre-fault voltage"
            testID="model-prefault"
          />
        </FormField>
      </View>
      <Choice
        label="System frequency"
        value={String(model.frequencyHz ?? 60) as '50' | '60'}
        options={[
          { value: '60', label: '60 Hz' },
          { value: '50', label: '50 Hz' },
        ]}
        onChange={(v) => editable && commit({ ...model, frequencyHz: v === '50' ? 50 : 60 })}
        testID="model-frequency"
      />
    </Card>
  );
}

// ---------------------------------------------------------------------------------------------
// One collection: toolbar, then table rows (wide) or cards (phone)

interface SectionProps {
  collection: CollectionKey;
  model: ModelInput;
  grouped: ReturnType<typeof groupIssues>;
  ctx: EditorContext;
  editable: boolean;
  wide: boolean;
  expanded: Set<string>;
  focus: Focus | null;
  actions: RowActions;
  filter: string;
  setFilter: (s: string) => void;
  onAdd: (collection: CollectionKey, variant?: NewVariant) => void;
}

const CELL_PAD = 4;
const STATUS_W = 40;
const ACTIONS_W = 86;
/** On the web, the id column and the row actions stay in view while the table scrolls sideways. */
const stickLeft = (Platform.OS === 'web' ? { position: 'sticky', left: 0, zIndex: 2 } : {}) as unknown as ViewStyle;
const stickRight = (Platform.OS === 'web' ? { position: 'sticky', right: 0, zIndex: 2 } : {}) as unknown as ViewStyle;

function CollectionSection({
  collection,
  model,
  grouped,
  ctx,
  editable,
  wide,
  expanded,
  focus,
  actions,
  filter,
  setFilter,
  onAdd,
}: SectionProps) {
  const items = itemsOf(model, collection) as readonly AnyElement[];
  const columns = COLUMNS[collection] as Column<AnyElement>[];
  const labels = COLLECTION_LABELS[collection];
  const q = filter.trim().toLowerCase();
  const indexes = useMemo(() => {
    const all = items.map((_, i) => i);
    return q ? all.filter((i) => searchText(collection, items[i]).includes(q)) : all;
  }, [items, q, collection]);
  const sectionIssues = grouped.general.filter((g) => g.collection === collection);

  const addButtons = editable ? (
    collection === 'sources' ? (
      <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>
        <AddButton title="Add utility" onPress={() => onAdd('sources', 'utility')} testID="model-add-utility" />
        <AddButton title="Add generator" onPress={() => onAdd('sources', 'generator')} testID="model-add-generator" />
      </View>
    ) : (
      <AddButton
        title={`Add ${labels.singular}`}
        onPress={() => onAdd(collection)}
        testID={`model-add-${collection}`}
      />
    )
  ) : null;

  return (
    <View style={{ gap: space.md }} testID={`model-section-body-${collection}`}>
      <View style={{ flexDirection: wide ? 'row' : 'column', alignItems: wide ? 'center' : 'stretch', gap: space.md }}>
        <View style={{ flex: wide ? 1 : undefined, gap: 2 }}>
          <T variant="heading">
            {labels.plural}{' '}
            <T style={{ fontFamily: fonts.numbers, fontSize: 18, color: colors.muted }}>{items.length}</T>
          </T>
          <T variant="small">{SECTION_NOTES[collection]}</T>
        </View>
        {items.length > 6 ? (
          <FilterBox value={filter} onChange={setFilter} wide={wide} label={`Find ${labels.plural.toLowerCase()}`} />
        ) : null}
        {addButtons}
      </View>
      {sectionIssues.map((li, i) => (
        <T key={i} style={{ color: colors.danger, fontSize: 15 }}>
          {issueMessage(li.issue)}
        </T>
      ))}
      {items.length === 0 ? (
        <Card style={{ borderStyle: 'dashed', borderColor: colors.line, alignItems: 'flex-start' }}>
          <T variant="small">{`No ${labels.plural.toLowerCase()} yet.`}</T>
        </Card>
      ) : indexes.length === 0 ? (
        <T variant="small">{`No ${labels.plural.toLowerCase()} match “${filter}”.`}</T>
      ) : wide ? (
        <Card style={{ padding: 0, gap: 0, overflow: 'hidden' }}>
          <ScrollView horizontal contentContainerStyle={{ flexGrow: 1 }}>
            <View style={{ minWidth: '100%' }}>
              <TableHeader columns={columns} />
              {indexes.map((i) => {
                const key = elementKey(collection, i);
                return (
                  <TableRow
                    key={key}
                    collection={collection}
                    index={i}
                    element={items[i]}
                    issues={grouped.byElement.get(key) ?? NO_ISSUES}
                    ctx={ctx}
                    editable={editable}
                    focused={focus?.key === key ? focus.nonce : 0}
                    actions={actions}
                  />
                );
              })}
            </View>
          </ScrollView>
        </Card>
      ) : (
        <View style={{ gap: space.sm }}>
          {indexes.map((i) => {
            const key = elementKey(collection, i);
            return (
              <CardRow
                key={key}
                collection={collection}
                index={i}
                element={items[i]}
                issues={grouped.byElement.get(key) ?? NO_ISSUES}
                ctx={ctx}
                editable={editable}
                focused={focus?.key === key ? focus.nonce : 0}
                expanded={expanded.has(key)}
                actions={actions}
              />
            );
          })}
        </View>
      )}
    </View>
  );
}

function AddButton({ title, onPress, testID }: { title: string; onPress: () => void; testID: string }) {
  return (
    <Pressable
      accessibilityRole="button"
      onPress={onPress}
      testID={testID}
      style={({ pressed }) => ({
        minHeight: touch.min,
        paddingHorizontal: space.lg,
        borderRadius: radius.md,
        backgroundColor: colors.accent,
        flexDirection: 'row',
        alignItems: 'center',
        justifyContent: 'center',
        gap: space.sm,
        opacity: pressed ? 0.85 : 1,
      })}
    >
      <Icon name="plus" size={18} color={colors.accentInk} />
      <T style={{ color: colors.accentInk, fontFamily: fonts.textBold, fontSize: 16 }}>{title}</T>
    </Pressable>
  );
}

function FilterBox({
  value,
  onChange,
  wide,
  label,
}: {
  value: string;
  onChange: (s: string) => void;
  wide: boolean;
  label: string;
}) {
  return (
    <View
      style={{
        width: wide ? 240 : undefined,
        height: touch.min,
        flexDirection: 'row',
        alignItems: 'center',
        gap: space.sm,
        borderWidth: 1.5,
        borderColor: colors.line,
        borderRadius: radius.sm,
        paddingHorizontal: space.md,
        backgroundColor: colors.surface,
      }}
    >
      <Icon name="search" size={18} color={colors.muted} />
      <TextInput
        value={value}
        onChangeText={onChange}
        placeholder={label}
        placeholderTextColor={colors.muted}
        accessibilityLabel={label}
        autoCapitalize="none"
        autoCorrect={false}
        testID="model-filter"
        style={{ flex: 1, height: '100%', minWidth: 0, fontSize: 16, fontFamily: fonts.text, color: colors.ink }}
      />
      {value ? <IconButton icon="close" label="Clear" size={32} onPress={() => onChange('')} /> : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Table (wide)

const TableHeader = memo(function TableHeader({ columns }: { columns: Column<AnyElement>[] }) {
  const [first, ...rest] = columns;
  const cell = (c: Column<AnyElement>) => (
    <View key={c.key} style={{ width: c.width, paddingHorizontal: CELL_PAD + 2, paddingVertical: space.sm }}>
      <T variant="label" numberOfLines={1}>
        {c.label}
        {c.unit ? <T variant="label" style={{ color: colors.muted, fontFamily: fonts.text }}>{` ${c.unit}`}</T> : null}
      </T>
    </View>
  );
  return (
    <View
      style={{
        flexDirection: 'row',
        alignItems: 'flex-end',
        backgroundColor: colors.canvas,
        borderBottomWidth: 1,
        borderBottomColor: colors.line,
      }}
    >
      <View style={[{ flexDirection: 'row', alignItems: 'flex-end', backgroundColor: colors.canvas }, stickLeft]}>
        <View style={{ width: STATUS_W }} />
        {cell(first)}
      </View>
      {rest.map(cell)}
      <View style={{ flex: 1 }} />
      <View style={[{ width: ACTIONS_W, alignSelf: 'stretch', backgroundColor: colors.canvas }, stickRight]} />
    </View>
  );
});

interface RowProps {
  collection: CollectionKey;
  index: number;
  element: AnyElement;
  issues: readonly LocatedIssue[];
  ctx: EditorContext;
  editable: boolean;
  focused: number;
  actions: RowActions;
}

/** Issue messages by column (-1: the element as a whole). */
function useIssueColumns(issues: readonly LocatedIssue[], columns: Column<AnyElement>[]) {
  return useMemo(() => {
    const byColumn = new Map<number, LocatedIssue[]>();
    for (const li of issues) {
      const c = matchField(li.field, columns);
      const list = byColumn.get(c);
      if (list) list.push(li);
      else byColumn.set(c, [li]);
    }
    return byColumn;
  }, [issues, columns]);
}

/** Scrolls the element into view when it becomes the focus of a jump (web). */
function useScrollIntoView(focused: number) {
  const ref = useRef<View>(null);
  useEffect(() => {
    if (!focused || Platform.OS !== 'web') return;
    const node = ref.current as unknown as { scrollIntoView?: (o: object) => void } | null;
    // After the section and card have rendered.
    const id = setTimeout(() => node?.scrollIntoView?.({ block: 'center', behavior: 'smooth' }), 30);
    return () => clearTimeout(id);
  }, [focused]);
  return ref;
}

const TableRow = memo(function TableRow({
  collection,
  index,
  element,
  issues,
  ctx,
  editable,
  focused,
  actions,
}: RowProps) {
  const columns = COLUMNS[collection] as Column<AnyElement>[];
  const byColumn = useIssueColumns(issues, columns);
  const ref = useScrollIntoView(focused);
  const patch = useCallback(
    (u: (e: AnyElement) => AnyElement) => actions.patch(collection, index, u),
    [actions, collection, index],
  );
  const rename = useCallback((id: string) => actions.rename(collection, index, id), [actions, collection, index]);
  const bad = issues.length > 0;
  const base = `${collection}-${index}`;
  const rowBg = focused ? colors.accentSoft : bad ? '#FFF8F8' : colors.surface;
  const cell = (c: Column<AnyElement>, ci: number) => (
    <View key={c.key} style={{ width: c.width, paddingHorizontal: CELL_PAD }}>
      {!c.applies || c.applies(element, ctx) ? (
        c.render({
          e: element,
          size: 'cell',
          invalid: byColumn.has(ci),
          editable,
          patch,
          rename,
          ctx,
          testID: `${base}-${c.key}`,
          label: `${element.id || `${COLLECTION_LABELS[collection].singular} ${index + 1}`} ${c.label}`,
        })
      ) : (
        <NotApplicable />
      )}
    </View>
  );
  return (
    <View
      ref={ref}
      testID={`row-${base}`}
      style={{
        borderBottomWidth: 1,
        borderBottomColor: colors.lineSoft,
        backgroundColor: rowBg,
        borderLeftWidth: 3,
        borderLeftColor: focused ? colors.accent : bad ? colors.danger : 'transparent',
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'flex-start' }}>
        <View
          style={[
            {
              flexDirection: 'row',
              alignItems: 'flex-start',
              backgroundColor: rowBg,
              alignSelf: 'stretch',
              paddingVertical: 6,
            },
            stickLeft,
          ]}
        >
          <View style={{ width: STATUS_W - 3, height: 38, alignItems: 'center', justifyContent: 'center' }}>
            <T style={{ fontFamily: fonts.numbers, fontSize: 13, color: bad ? colors.danger : colors.muted }}>
              {index + 1}
            </T>
          </View>
          {cell(columns[0], 0)}
        </View>
        <View style={{ flexDirection: 'row', alignItems: 'flex-start', paddingVertical: 6 }}>
          {columns.slice(1).map((c, i) => cell(c, i + 1))}
        </View>
        <View style={{ flex: 1 }} />
        <View
          style={[
            {
              width: ACTIONS_W,
              alignSelf: 'stretch',
              flexDirection: 'row',
              justifyContent: 'flex-end',
              paddingTop: 6,
              paddingRight: 6,
              gap: 2,
              backgroundColor: rowBg,
            },
            stickRight,
          ]}
        >
          {editable ? (
            <>
              <IconButton
                icon="copy"
                label={`Duplicate ${element.id}`}
                onPress={() => actions.duplicate(collection, index)}
                testID={`${base}-duplicate`}
                size={38}
              />
              <IconButton
                icon="trash"
                label={`Delete ${element.id}`}
                tone="danger"
                onPress={() => actions.remove(collection, index)}
                testID={`${base}-delete`}
                size={38}
              />
            </>
          ) : null}
        </View>
      </View>
      {bad ? (
        <View
          style={[
            {
              paddingLeft: STATUS_W - 3 + CELL_PAD,
              paddingRight: space.md,
              paddingBottom: space.sm,
              gap: 2,
              alignSelf: 'flex-start',
              maxWidth: 900,
            },
            stickLeft,
          ]}
          testID={`${base}-issues`}
        >
          {issues.map((li, i) => (
            <View key={i} style={{ flexDirection: 'row', alignItems: 'flex-start', gap: 6 }}>
              <View style={{ marginTop: 2 }}>
                <Icon name="alert" size={15} color={colors.danger} />
              </View>
              <T style={{ fontSize: 14, lineHeight: 19, color: colors.danger, flexShrink: 1 }}>
                {li.field ? (
                  <T
                    style={{ fontFamily: fonts.textBold, fontSize: 14, color: colors.danger }}
                  >{`${fieldLabel(li.field)}: `}</T>
                ) : null}
                {issueMessage(li.issue)}
              </T>
            </View>
          ))}
        </View>
      ) : null}
    </View>
  );
});

// ---------------------------------------------------------------------------------------------
// Cards (phone)

const CardRow = memo(function CardRow({
  collection,
  index,
  element,
  issues,
  ctx,
  editable,
  focused,
  expanded,
  actions,
}: RowProps & { expanded: boolean }) {
  const columns = COLUMNS[collection] as Column<AnyElement>[];
  const byColumn = useIssueColumns(issues, columns);
  const ref = useScrollIntoView(focused);
  const patch = useCallback(
    (u: (e: AnyElement) => AnyElement) => actions.patch(collection, index, u),
    [actions, collection, index],
  );
  const rename = useCallback((id: string) => actions.rename(collection, index, id), [actions, collection, index]);
  const key = elementKey(collection, index);
  const base = `${collection}-${index}`;
  const bad = issues.length > 0;
  const general = byColumn.get(-1) ?? [];
  const cardStyle: ViewStyle = {
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: focused ? 2 : 1,
    borderColor: focused ? colors.accent : bad ? '#E7B4B4' : colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: bad ? colors.danger : focused ? colors.accent : colors.lineSoft,
    overflow: 'hidden',
  };
  return (
    <View ref={ref} style={cardStyle} testID={`card-${base}`}>
      <Pressable
        accessibilityRole="button"
        aria-expanded={expanded}
        accessibilityLabel={`${element.id}, ${expanded ? 'collapse' : 'expand'}`}
        onPress={() => actions.toggle(key)}
        testID={`${base}-toggle`}
        style={({ pressed }) => ({
          minHeight: 56,
          paddingVertical: space.sm,
          paddingLeft: space.md,
          paddingRight: space.sm,
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          backgroundColor: pressed ? colors.canvas : 'transparent',
        })}
      >
        <View style={{ flex: 1, gap: 2, minWidth: 0 }}>
          <T numberOfLines={1} style={{ fontSize: 16 }}>
            <T style={{ fontFamily: fonts.textBold, fontSize: 16 }}>{element.id || '(no id)'}</T>
            {element.name ? <T style={{ color: colors.muted, fontSize: 15 }}>{`  ${element.name}`}</T> : null}
          </T>
          <T numberOfLines={expanded ? undefined : 1} style={{ fontSize: 14, lineHeight: 19, color: colors.inkSoft }}>
            {elementSummary(collection, element)}
          </T>
          {bad && !expanded ? (
            <T numberOfLines={1} style={{ fontSize: 14, lineHeight: 19, color: colors.danger }}>
              {`${problemCount(issues.length)}: ${issues[0].field ? `${fieldLabel(issues[0].field)} — ` : ''}${issueMessage(issues[0].issue)}`}
            </T>
          ) : null}
        </View>
        {bad ? (
          <View
            style={{
              minWidth: 22,
              height: 22,
              borderRadius: 11,
              paddingHorizontal: 6,
              backgroundColor: colors.danger,
              alignItems: 'center',
              justifyContent: 'center',
            }}
          >
            <T style={{ color: '#FFFFFF', fontFamily: fonts.numbersBold, fontSize: 12, lineHeight: 16 }}>
              {issues.length}
            </T>
          </View>
        ) : null}
        <Icon name={expanded ? 'chevron-down' : 'chevron-right'} size={20} color={colors.muted} />
      </Pressable>
      {expanded ? (
        <View
          style={{
            paddingHorizontal: space.md,
            paddingBottom: space.md,
            paddingTop: space.xs,
            gap: space.md,
            borderTopWidth: 1,
            borderTopColor: colors.lineSoft,
          }}
        >
          {general.map((li, i) => (
            <T key={i} style={{ color: colors.danger, fontSize: 15 }}>
              {`${li.field ? `${fieldLabel(li.field)}: ` : ''}${issueMessage(li.issue)}`}
            </T>
          ))}
          <View
            style={{
              flexDirection: 'row',
              flexWrap: 'wrap',
              columnGap: space.md,
              rowGap: space.md,
              paddingTop: space.sm,
            }}
          >
            {columns.map((c, ci) => {
              if (c.applies && !c.applies(element, ctx)) return null;
              const problems = byColumn.get(ci);
              return (
                <FormField
                  key={c.key}
                  label={c.formLabel ?? c.label}
                  unit={c.unit}
                  basis={c.basis ?? 140}
                  error={problems ? problems.map((li) => issueMessage(li.issue)).join(' · ') : undefined}
                  hint={c.hint?.(element, ctx)}
                >
                  {c.render({
                    e: element,
                    size: 'form',
                    invalid: !!problems,
                    editable,
                    patch,
                    rename,
                    ctx,
                    testID: `${base}-${c.key}`,
                    label: `${element.id} ${c.label}`,
                  })}
                </FormField>
              );
            })}
          </View>
          {editable ? (
            <View style={{ flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end', flexWrap: 'wrap' }}>
              <Button
                title="Duplicate"
                kind="secondary"
                onPress={() => actions.duplicate(collection, index)}
                testID={`${base}-duplicate`}
              />
              <Pressable
                accessibilityRole="button"
                onPress={() => actions.remove(collection, index)}
                testID={`${base}-delete`}
                style={({ pressed }) => ({
                  minHeight: touch.min,
                  paddingHorizontal: space.lg,
                  borderRadius: radius.md,
                  borderWidth: 1,
                  borderColor: '#E7B4B4',
                  backgroundColor: pressed ? colors.dangerSoft : colors.surface,
                  flexDirection: 'row',
                  alignItems: 'center',
                  gap: space.sm,
                })}
              >
                <Icon name="trash" size={18} color={colors.danger} />
                <T style={{ color: colors.danger, fontFamily: fonts.textBold, fontSize: 16 }}>Delete</T>
              </Pressable>
            </View>
          ) : null}
        </View>
      ) : null}
    </View>
  );
});

// ---------------------------------------------------------------------------------------------
// Undo after a delete

function UndoToast({ text, onUndo, onDismiss }: { text: string; onUndo: () => void; onDismiss: () => void }) {
  const { wide } = useLayout();
  // Sticky to the bottom of the view while the editor is on screen (web); inline after the section elsewhere.
  const stick = (Platform.OS === 'web'
    ? { position: 'sticky', bottom: wide ? space.xl : space.md, zIndex: 5 }
    : {}) as unknown as ViewStyle;
  return (
    <View
      accessibilityRole="alert"
      testID="model-undo"
      style={[
        stick,
        {
          alignSelf: wide ? 'flex-end' : 'stretch',
          maxWidth: 560,
          backgroundColor: colors.ink,
          borderRadius: radius.md,
          paddingVertical: space.xs,
          paddingLeft: space.lg,
          paddingRight: space.xs,
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.sm,
          shadowColor: '#000',
          shadowOpacity: 0.25,
          shadowRadius: 12,
          shadowOffset: { width: 0, height: 4 },
        },
      ]}
    >
      <T style={{ color: colors.navInk, flex: 1, fontSize: 15 }}>{text}</T>
      <Pressable
        accessibilityRole="button"
        onPress={onUndo}
        testID="model-undo-button"
        style={{
          minHeight: touch.min,
          paddingHorizontal: space.md,
          flexDirection: 'row',
          alignItems: 'center',
          gap: 6,
        }}
      >
        <Icon name="undo" size={18} color="#9FE3E8" />
        <T style={{ color: '#9FE3E8', fontFamily: fonts.textBold }}>Undo</T>
      </Pressable>
      <IconButton icon="close" label="Dismiss" onPress={onDismiss} color={colors.navMuted} />
    </View>
  );
}
