/**
 * Operating scenarios: the list (add, duplicate, delete; id and name edited on the chosen one), and for the chosen
 * scenario every source, tie and motor of the model with what the scenario makes of it. Each field shows the base
 * value (the model as written) and writes an override only when it differs; clearing it goes back to the base.
 * Wide screens: a table of scenarios and the chosen one's detail below it. Phone: one collapsible card per scenario.
 */
import { memo, useCallback, useMemo, useState, type ReactNode } from 'react';
import { Pressable, StyleSheet, View, type ViewStyle } from 'react-native';
import type { ModelInput } from '../../../shared/schemas/model';
import { colors, fonts, radius, space, touch } from '../../theme';
import { Button, Card, T } from '../../ui';
import { CheckCell, FormField, Icon, IconButton, NumCell, SegCell, TextCell } from '../controls';
import { withField } from '../edit';
import { DeleteButton } from './DeleteButton';
import { ProblemBadge } from './ProblemBadge';
import {
  addScenario,
  baseFaultText,
  clearOverride,
  deleteScenario,
  duplicateScenario,
  faultUnit,
  motorRunsIn,
  newScenario,
  scenarioSummary,
  setAllMotorsOff,
  setMotorRunning,
  setSourceFault,
  setSourceInService,
  setSourceXr,
  setTieClosed,
  tieBaseClosed,
  tieClosedIn,
  unknownOverrides,
  updateScenario,
  type OverrideKind,
  type ScenarioInput,
  type SourceOverride,
} from '../scenarios';
import {
  elementKey,
  groupIssues,
  issueMessage,
  num,
  problemCount,
  scenarioFieldLabel,
  scenarioIssueTarget,
  type LocatedIssue,
  type MotorInput,
  type SourceInput,
  type TieInput,
} from '../summaries';
import { AddButton, FilterBox } from './CollectionSection';
import { useScrollIntoView } from './rowHooks';
import { type Focus, NO_ISSUES, SECTION_NOTES } from './types';

type Patch = (update: (s: ScenarioInput) => ScenarioInput) => void;

interface Props {
  model: ModelInput;
  grouped: ReturnType<typeof groupIssues>;
  editable: boolean;
  wide: boolean;
  commit: (m: ModelInput) => void;
  latest: () => ModelInput;
  focus: Focus | null;
  onDeleted: (text: string, before: ModelInput, after: ModelInput) => void;
}

const focusedIndex = (focus: Focus | null): number | null =>
  focus && focus.key.startsWith('scenarios[') ? Number(focus.key.slice('scenarios['.length, -1)) : null;

export function ScenariosSection({ model, grouped, editable, wide, commit, latest, focus, onDeleted }: Props) {
  const scenarios = model.scenarios ?? [];
  // The chosen scenario: the one a jump to a problem (the issue summary) asks for, else the first on a wide screen;
  // none (all cards closed) on a phone.
  const [open, setOpen] = useState<number | null>(() => focusedIndex(focus) ?? (wide && scenarios.length ? 0 : null));
  const [seenFocus, setSeenFocus] = useState(focus);
  if (focus !== seenFocus) {
    setSeenFocus(focus);
    const i = focusedIndex(focus);
    if (i !== null) setOpen(i);
  }
  const chosen = open !== null && open < scenarios.length ? open : wide && scenarios.length ? 0 : null;
  const sectionIssues = grouped.general.filter((g) => g.collection === 'scenarios');

  const add = () => {
    const r = addScenario(latest(), newScenario(latest()));
    commit(r.model);
    setOpen(r.index);
  };
  const duplicate = useCallback(
    (index: number) => {
      const r = duplicateScenario(latest(), index);
      commit(r.model);
      setOpen(r.index);
    },
    [commit, latest],
  );
  const remove = useCallback(
    (index: number) => {
      const before = latest();
      const s = (before.scenarios ?? [])[index];
      if (!s) return;
      const after = deleteScenario(before, index);
      onDeleted(`Deleted scenario ${s.id || `#${index + 1}`}`, before, after);
      commit(after);
      setOpen(null);
    },
    [commit, latest, onDeleted],
  );

  const detail = (index: number) => (
    <ScenarioDetail
      key={index}
      index={index}
      scenario={scenarios[index]}
      model={model}
      issues={grouped.byElement.get(elementKey('scenarios', index)) ?? NO_ISSUES}
      editable={editable}
      wide={wide}
      commit={commit}
      latest={latest}
      onDuplicate={duplicate}
      onDelete={remove}
      focused={focus && focus.key === elementKey('scenarios', index) ? focus.nonce : 0}
      focusField={focus?.field}
    />
  );

  return (
    <View style={styles.section} testID="model-section-body-scenarios">
      <View style={[styles.header, wide ? styles.headerWide : null]}>
        <View style={[styles.headerTitle, wide ? styles.headerTitleWide : null]}>
          <T variant="heading">
            Scenarios <T style={styles.count}>{scenarios.length}</T>
          </T>
          <T variant="small">{SECTION_NOTES.scenarios}</T>
        </View>
        {editable ? <AddButton title="Add scenario" onPress={add} testID="model-add-scenarios" /> : null}
      </View>
      {sectionIssues.map((li, i) => (
        <T key={i} style={styles.problem}>
          {issueMessage(li.issue)}
        </T>
      ))}
      {wide ? (
        <Card style={styles.listCard}>
          <ListHeader />
          <BaseRow wide />
          {scenarios.map((s, i) => (
            <ScenarioListRow
              key={i}
              index={i}
              scenario={s}
              summary={scenarioSummary(model, s)}
              problems={(grouped.byElement.get(elementKey('scenarios', i)) ?? NO_ISSUES).length}
              chosen={chosen === i}
              wide
              onPress={() => setOpen(i)}
            />
          ))}
        </Card>
      ) : (
        <View style={styles.cards}>
          <BaseRow wide={false} />
          {scenarios.map((s, i) => (
            <View key={i} testID={`card-scenarios-${i}`} style={[styles.card, chosen === i ? styles.cardChosen : null]}>
              <ScenarioListRow
                index={i}
                scenario={s}
                summary={scenarioSummary(model, s)}
                problems={(grouped.byElement.get(elementKey('scenarios', i)) ?? NO_ISSUES).length}
                chosen={chosen === i}
                wide={false}
                onPress={() => setOpen(chosen === i ? null : i)}
              />
              {chosen === i ? <View style={styles.cardDetail}>{detail(i)}</View> : null}
            </View>
          ))}
        </View>
      )}
      {scenarios.length === 0 ? (
        <Card style={styles.empty}>
          <T variant="small">
            No scenarios yet: only the model as written is run. Add one for each state the plant runs in — the utility
            at its minimum fault level, a tie closed, the generator alone, motors stopped.
          </T>
        </Card>
      ) : null}
      {wide && chosen !== null ? <Card testID="scenario-detail-card">{detail(chosen)}</Card> : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// The list

const LIST_ID_WIDTH = 150;
const LIST_NAME_WIDTH = 260;

function ListHeader() {
  const cell = (label: string, style: ViewStyle) => (
    <View style={[styles.listHeadCell, style]}>
      <T variant="label" style={styles.listHeadText}>
        {label}
      </T>
    </View>
  );
  return (
    <View style={styles.listHead}>
      {cell('Id', styles.listHeadId)}
      {cell('Name', styles.listHeadName)}
      {cell('What it changes', styles.listHeadSummary)}
    </View>
  );
}

function BaseRow({ wide }: { wide: boolean }) {
  const text = 'The model as written — always run';
  if (!wide) {
    return (
      <View testID="scenario-base" style={styles.baseCard}>
        <T style={styles.baseId}>base</T>
        <T variant="small">{text}</T>
      </View>
    );
  }
  return (
    <View testID="scenario-base" style={styles.baseRow}>
      <T style={styles.baseRowId}>base</T>
      <T style={styles.baseRowName}>Model as written</T>
      <T variant="small" style={styles.baseRowNote}>
        Always run; the scenarios below change it
      </T>
    </View>
  );
}

const ScenarioListRow = memo(function ScenarioListRow({
  index,
  scenario,
  summary,
  problems,
  chosen,
  wide,
  onPress,
}: {
  index: number;
  scenario: ScenarioInput;
  summary: string;
  problems: number;
  chosen: boolean;
  wide: boolean;
  onPress: () => void;
}) {
  const badge = problems ? <ProblemBadge count={problems} label={problemCount(problems)} /> : null;
  const idText = scenario.id || '(no id)';
  if (wide) {
    return (
      <Pressable
        accessibilityRole="button"
        aria-pressed={chosen}
        onPress={onPress}
        testID={`scenario-row-${index}`}
        style={({ hovered }: { pressed: boolean; hovered?: boolean }) => [
          styles.listRow,
          chosen
            ? styles.listRowChosen
            : [problems ? styles.listRowProblem : null, hovered ? styles.listRowHovered : null],
        ]}
      >
        <T numberOfLines={1} style={styles.listRowId}>
          {idText}
        </T>
        <T numberOfLines={1} style={styles.listRowName}>
          {scenario.name || <T style={styles.noName}>no name</T>}
        </T>
        <T numberOfLines={2} style={styles.listRowSummary} testID={`scenario-summary-${index}`}>
          {summary}
        </T>
        <View style={styles.listRowBadge}>{badge}</View>
      </Pressable>
    );
  }
  return (
    <Pressable
      accessibilityRole="button"
      aria-expanded={chosen}
      onPress={onPress}
      testID={`scenario-row-${index}`}
      style={({ pressed }) => [
        styles.cardRow,
        problems ? styles.cardRowProblem : chosen ? styles.cardRowChosen : null,
        pressed ? styles.cardRowPressed : null,
      ]}
    >
      <View style={styles.cardRowText}>
        <T numberOfLines={1} style={styles.cardRowTitle}>
          <T style={styles.cardRowId}>{idText}</T>
          {scenario.name ? <T style={styles.cardRowName}>{`  ${scenario.name}`}</T> : null}
        </T>
        <T numberOfLines={chosen ? undefined : 2} style={styles.cardRowSummary} testID={`scenario-summary-${index}`}>
          {summary}
        </T>
      </View>
      {badge}
      <Icon name={chosen ? 'chevron-down' : 'chevron-right'} size={20} color={colors.muted} />
    </Pressable>
  );
});

// ---------------------------------------------------------------------------------------------
// The chosen scenario

/** A scenario's issues by the element they name (`sources:UTIL-1`) and field (`xr`, or '' for the element). */
function issuesByTarget(issues: readonly LocatedIssue[]) {
  const byElement = new Map<string, Map<string, string[]>>();
  const scenario = new Map<string, string[]>();
  const push = (m: Map<string, string[]>, k: string, msg: string) => m.set(k, [...(m.get(k) ?? []), msg]);
  for (const li of issues) {
    const t = scenarioIssueTarget(li.field);
    const msg = issueMessage(li.issue);
    if ('kind' in t) {
      const key = `${t.kind}:${t.id}`;
      const m = byElement.get(key) ?? new Map<string, string[]>();
      byElement.set(key, m);
      const sub = t.sub === 'shortCircuitKa' ? 'shortCircuitMva' : (t.sub ?? '');
      push(m, sub, msg);
    } else push(scenario, t.field ?? '', msg);
  }
  return { byElement, scenario };
}

const NO_FIELD_ISSUES: ReadonlyMap<string, string[]> = new Map();
const MOTOR_FILTER_FROM = 8;

function ScenarioDetail({
  index,
  scenario,
  model,
  issues,
  editable,
  wide,
  commit,
  latest,
  onDuplicate,
  onDelete,
  focused,
  focusField,
}: {
  index: number;
  scenario: ScenarioInput;
  model: ModelInput;
  issues: readonly LocatedIssue[];
  editable: boolean;
  wide: boolean;
  commit: (m: ModelInput) => void;
  latest: () => ModelInput;
  onDuplicate: (index: number) => void;
  onDelete: (index: number) => void;
  focused: number;
  focusField: string | undefined;
}) {
  // A jump to a problem of one element scrolls to that element's row; otherwise to the scenario.
  const target = focused ? scenarioIssueTarget(focusField) : null;
  const targetKey = target && 'kind' in target ? `${target.kind}:${target.id}` : null;
  const rowFocus = (key: string) => (targetKey === key ? focused : 0);
  const ref = useScrollIntoView(targetKey ? 0 : focused);
  const patch = useCallback<Patch>(
    (update) => commit(updateScenario(latest(), index, update)),
    [commit, latest, index],
  );
  const { byElement, scenario: scenarioIssues } = useMemo(() => issuesByTarget(issues), [issues]);
  const sources = model.sources ?? [];
  const ties = model.ties ?? [];
  const motors = model.motors ?? [];
  const orphans = unknownOverrides(model, scenario);
  // A long motor list (a plant of many MCCs) is found by id, name or bus.
  const [motorFilter, setMotorFilter] = useState('');
  const q = motorFilter.trim().toLowerCase();
  const shownMotors = motors
    .map((m, i) => ({ m, i }))
    .filter(({ m }) => !q || `${m.id} ${m.name ?? ''} ${m.bus}`.toLowerCase().includes(q));
  const fieldError = (f: string) => scenarioIssues.get(f)?.join(' · ');
  const others = [...scenarioIssues.entries()].filter(([f]) => f !== 'id' && f !== 'name');
  const base = `scenario-${index}`;

  return (
    <View ref={ref} style={styles.detail} testID={`scenario-detail-${index}`}>
      <View style={styles.detailHead}>
        <FormField
          label="Id"
          basis={140}
          error={fieldError('id')}
          hint={wide ? 'Used in results and exports' : undefined}
        >
          <TextCell
            value={scenario.id}
            onChange={(id) => patch((s) => ({ ...s, id: id.trim() }))}
            commit="blur"
            mono
            size="form"
            invalid={!!fieldError('id')}
            editable={editable}
            placeholder="Id"
            testID={`${base}-id`}
            accessibilityLabel="Scenario id"
          />
        </FormField>
        <FormField label="Name" basis={260} error={fieldError('name')}>
          <TextCell
            value={scenario.name}
            onChange={(v) => patch((s) => withField(s, 'name', v === '' ? undefined : v))}
            size="form"
            invalid={!!fieldError('name')}
            editable={editable}
            placeholder="e.g. Utility minimum, tie open"
            testID={`${base}-name`}
            accessibilityLabel="Scenario name"
          />
        </FormField>
        {editable ? (
          <View style={[styles.detailActions, wide ? styles.detailActionsWide : null]}>
            <Button
              title="Duplicate"
              kind="secondary"
              onPress={() => onDuplicate(index)}
              testID={`${base}-duplicate`}
            />
            <DeleteButton onPress={() => onDelete(index)} testID={`${base}-delete`} />
          </View>
        ) : null}
      </View>
      <View style={styles.changes}>
        <T variant="label" style={styles.changesLabel}>
          Changes against the base
        </T>
        <T style={styles.changesText} testID={`${base}-changes`}>
          {scenarioSummary(model, scenario)}
        </T>
      </View>
      {others.map(([f, msgs]) => (
        <T key={f} style={styles.problem} accessibilityRole="alert">
          {`${f ? `${scenarioFieldLabel(f)}: ` : ''}${msgs.join(' · ')}`}
        </T>
      ))}

      <Group
        title="Sources"
        note="In service, available fault level and X/R. An empty field keeps the base value."
        count={sources.length}
        wide={wide}
        columns={[
          { label: 'In service', width: SERVICE_WIDTH },
          { label: 'Short circuit', width: FAULT_WIDTH },
          { label: 'X/R', width: XR_WIDTH },
        ]}
      >
        {sources.map((src, i) => (
          <SourceRow
            key={`${i}:${src.id}`}
            source={src}
            override={scenario.sources?.[src.id]}
            issues={byElement.get(`sources:${src.id}`) ?? NO_FIELD_ISSUES}
            editable={editable}
            wide={wide}
            patch={patch}
            focused={rowFocus(`sources:${src.id}`)}
            testID={`scenario-source-${src.id}`}
          />
        ))}
      </Group>

      {ties.length ? (
        <Group
          title="Ties"
          note="Open or closed in this scenario; the base state is the tie's own."
          count={ties.length}
          wide={wide}
          columns={[{ label: 'State', width: STATE_WIDTH }]}
        >
          {ties.map((t, i) => (
            <TieRow
              key={`${i}:${t.id}`}
              tie={t}
              closed={tieClosedIn(scenario, t)}
              overridden={scenario.ties?.[t.id] !== undefined}
              issues={byElement.get(`ties:${t.id}`) ?? NO_FIELD_ISSUES}
              editable={editable}
              wide={wide}
              patch={patch}
              focused={rowFocus(`ties:${t.id}`)}
              testID={`scenario-tie-${t.id}`}
            />
          ))}
        </Group>
      ) : null}

      {motors.length ? (
        <Group
          title="Motors"
          note="Running motors feed the fault. A motor's own choice wins over “all motors stopped”."
          count={motors.length}
          wide={wide}
          columns={[{ label: 'State', width: STATE_WIDTH }]}
          above={
            <View style={[styles.motorsAbove, wide ? styles.motorsAboveWide : null]}>
              <CheckCell
                value={scenario.allMotorsOff === true}
                onChange={(v) => patch((s) => setAllMotorsOff(s, v))}
                label="All motors stopped"
                size="form"
                editable={editable}
                testID={`${base}-all-motors-off`}
              />
              {motors.length > MOTOR_FILTER_FROM ? (
                <FilterBox value={motorFilter} onChange={setMotorFilter} wide={wide} label="Find motors" />
              ) : null}
            </View>
          }
        >
          {shownMotors.length === 0 ? (
            <T variant="small" style={styles.noMotors}>{`No motors match “${motorFilter}”.`}</T>
          ) : null}
          {shownMotors.map(({ m, i }) => (
            <MotorRow
              key={`${i}:${m.id}`}
              motor={m}
              running={motorRunsIn(scenario, m.id)}
              allOff={scenario.allMotorsOff === true}
              overridden={scenario.motors?.[m.id] !== undefined}
              issues={byElement.get(`motors:${m.id}`) ?? NO_FIELD_ISSUES}
              editable={editable}
              wide={wide}
              patch={patch}
              focused={rowFocus(`motors:${m.id}`)}
              testID={`scenario-motor-${m.id}`}
            />
          ))}
        </Group>
      ) : null}

      {orphans.length ? (
        <Group
          title="Not in the model"
          note="This scenario names elements the model no longer has (deleted, renamed or imported without them). Remove each, or give the element that id again."
          count={orphans.length}
          wide={false}
          columns={[]}
        >
          {orphans.map((o) => (
            <OrphanRow
              key={`${o.kind}:${o.id}`}
              kind={o.kind}
              id={o.id}
              messages={[...(byElement.get(`${o.kind}:${o.id}`)?.values() ?? [])].flat()}
              editable={editable}
              patch={patch}
              focused={rowFocus(`${o.kind}:${o.id}`)}
              testID={`scenario-orphan-${o.kind}-${o.id}`}
            />
          ))}
        </Group>
      ) : null}
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Element rows: one line with fixed columns on a wide screen, a block of labelled fields on a phone

// Sized so a row (with its "back to base" button) fits the editor's column beside the side navigation at 1280 px;
// narrower wide screens wrap the fields under the element's name.
const SERVICE_WIDTH = 236;
const FAULT_WIDTH = 244;
const XR_WIDTH = 96;
const STATE_WIDTH = 236;
const TITLE_WIDTH = 230;

function Group({
  title,
  note,
  count,
  wide,
  columns,
  above,
  children,
}: {
  title: string;
  note: string;
  count: number;
  wide: boolean;
  columns: { label: string; width: number }[];
  above?: ReactNode;
  children: ReactNode;
}) {
  return (
    <View style={styles.group}>
      <View style={styles.groupHead}>
        <T variant="subheading">
          {title} <T style={styles.groupCount}>{count}</T>
        </T>
        <T variant="small">{note}</T>
      </View>
      {above}
      <View style={styles.groupTable}>
        {wide && columns.length ? (
          <View style={styles.groupColumns}>
            <T variant="label" style={styles.groupElementHead}>
              Element
            </T>
            {columns.map((c) => (
              <T key={c.label} variant="label" style={[styles.groupColumnHead, { width: c.width }]}>
                {c.label}
              </T>
            ))}
          </View>
        ) : null}
        {children}
      </View>
    </View>
  );
}

/** The frame of one element's row: its id and what it is as written, the fields, a "back to base" button. */
function RowFrame({
  id,
  detail,
  changed,
  messages,
  wide,
  editable,
  onReset,
  inline,
  focused,
  testID,
  children,
}: {
  id: string;
  detail: string;
  changed: boolean;
  messages: string[];
  wide: boolean;
  editable: boolean;
  /** Several fields: a button takes them all back to the base (a single choice goes back by choosing the base). */
  onReset?: () => void;
  /** Phone: the one control sits beside the element's name instead of under it. */
  inline?: boolean;
  focused: number;
  testID: string;
  children: ReactNode;
}) {
  const ref = useScrollIntoView(focused);
  const reset = !onReset ? null : changed && editable ? (
    <IconButton icon="undo" label={`${id}: back to the base`} onPress={onReset} testID={`${testID}-reset`} />
  ) : (
    <View style={styles.resetPlaceholder} />
  );
  const title = (
    <View style={[styles.rowTitle, wide ? styles.rowTitleWide : styles.rowTitlePhone]}>
      <T numberOfLines={1} style={styles.rowTitleText}>
        <T style={styles.rowTitleId}>{id || '(no id)'}</T>
        {changed ? <T style={styles.rowChangedWord}>{'  changed'}</T> : null}
      </T>
      <T variant="small" numberOfLines={wide ? 2 : 3}>
        {detail}
      </T>
    </View>
  );
  const errors = messages.length ? (
    <T style={styles.rowErrors} accessibilityRole="alert">
      {messages.join(' · ')}
    </T>
  ) : null;
  const rowStyle = [styles.row, changed ? styles.rowChanged : null, messages.length ? styles.rowProblem : null];
  if (wide) {
    return (
      <View ref={ref} style={rowStyle} testID={testID}>
        <View style={styles.rowLineWide}>
          {title}
          {children}
          {reset ? <View style={styles.rowReset}>{reset}</View> : null}
        </View>
        {errors}
      </View>
    );
  }
  return (
    <View ref={ref} style={rowStyle} testID={testID}>
      <View style={styles.rowLine}>
        {title}
        {inline ? children : reset}
      </View>
      {inline ? null : <View style={styles.rowFields}>{children}</View>}
      {errors}
    </View>
  );
}

/** A field of a row: bare in a table column, labelled on a phone. */
function Field({
  wide,
  width,
  label,
  basis,
  error,
  children,
}: {
  wide: boolean;
  width: number;
  label: string;
  basis: number;
  error?: string;
  children: ReactNode;
}) {
  if (wide) {
    return (
      <View style={[styles.field, { width }]}>
        {children}
        {error ? (
          <T variant="small" style={styles.fieldError} accessibilityRole="alert">
            {error}
          </T>
        ) : null}
      </View>
    );
  }
  return (
    <FormField label={label} basis={basis} error={error}>
      {children}
    </FormField>
  );
}

const SourceRow = memo(function SourceRow({
  source,
  override,
  issues,
  editable,
  wide,
  patch,
  focused,
  testID,
}: {
  source: SourceInput;
  override: SourceOverride | undefined;
  issues: ReadonlyMap<string, string[]>;
  editable: boolean;
  wide: boolean;
  patch: Patch;
  focused: number;
  testID: string;
}) {
  const id = source.id;
  const size = wide ? 'cell' : 'form';
  const utility = source.kind === 'utility';
  // The unit chosen while no override value is entered yet (a value entered fixes the unit).
  const [unitChoice, setUnitChoice] = useState<'mva' | 'ka' | null>(null);
  const held = override?.shortCircuitMva !== undefined || override?.shortCircuitKa !== undefined;
  const unit = held ? faultUnit(source, override) : (unitChoice ?? faultUnit(source, override));
  const faultKey = unit === 'ka' ? 'shortCircuitKa' : 'shortCircuitMva';
  const err = (k: string) => issues.get(k)?.join(' · ');
  const inService = override?.inService !== false;
  const detail =
    source.kind === 'utility'
      ? `Utility at ${source.bus || '—'} · ${baseFaultText(source).replace('base: ', '')} · X/R ${num(source.xr)}`
      : `Generator at ${source.bus || '—'} · ${num(source.kva)} kVA · X/R ${num(source.xr)}`;
  const showFault = utility || held;
  return (
    <RowFrame
      id={id}
      detail={detail}
      changed={override !== undefined}
      messages={issues.get('') ?? []}
      wide={wide}
      editable={editable}
      onReset={() => patch((s) => clearOverride(s, 'sources', id))}
      focused={focused}
      testID={testID}
    >
      <Field wide={wide} width={SERVICE_WIDTH} label="In service" basis={220} error={err('inService')}>
        <SegCell
          value={inService ? 'in' : 'out'}
          options={[
            { value: 'in', label: 'In service' },
            { value: 'out', label: 'Out of service' },
          ]}
          onChange={(v) => patch((s) => setSourceInService(s, id, v === 'in'))}
          size={size}
          editable={editable}
          invalid={!!err('inService')}
          testID={`${testID}-service`}
          accessibilityLabel={`${id} in service`}
        />
      </Field>
      {showFault ? (
        <Field wide={wide} width={FAULT_WIDTH} label="Short circuit" basis={220} error={err('shortCircuitMva')}>
          <View style={styles.faultRow}>
            <NumCell
              value={override?.[faultKey]}
              onChange={(v) => patch((s) => setSourceFault(s, id, unit, v))}
              size={size}
              invalid={!!err('shortCircuitMva')}
              editable={editable}
              placeholder={utility ? baseFaultText(source) : 'generator: none'}
              testID={`${testID}-fault`}
              accessibilityLabel={`${id} short circuit in this scenario (${unit === 'ka' ? 'kA' : 'MVA'})`}
              style={styles.faultValue}
            />
            <SegCell
              value={unit}
              options={[
                { value: 'mva', label: 'MVA' },
                { value: 'ka', label: 'kA' },
              ]}
              onChange={(u) => {
                setUnitChoice(u);
                // A number means another thing in the other unit: the override's fault level is cleared.
                if (held) patch((s) => setSourceFault(s, id, u, undefined));
              }}
              size={size}
              editable={editable}
              testID={`${testID}-fault-unit`}
              accessibilityLabel={`${id} short circuit unit`}
              style={wide ? styles.faultUnitWide : styles.faultUnit}
            />
          </View>
        </Field>
      ) : wide ? (
        <View style={styles.faultNone}>
          <T style={styles.faultNoneText}>from its rating</T>
        </View>
      ) : null}
      <Field wide={wide} width={XR_WIDTH} label="X/R" basis={120} error={err('xr')}>
        <NumCell
          value={override?.xr}
          onChange={(v) => patch((s) => setSourceXr(s, id, v))}
          size={size}
          invalid={!!err('xr')}
          editable={editable}
          placeholder={`base: ${num(source.xr)}`}
          testID={`${testID}-xr`}
          accessibilityLabel={`${id} X/R in this scenario`}
        />
      </Field>
    </RowFrame>
  );
});

/** A choice of two states: a table cell (wide), or beside the element's name (phone). */
function StateField({ wide, children }: { wide: boolean; children: ReactNode }) {
  return <View style={[styles.state, wide ? styles.stateWide : null]}>{children}</View>;
}

const TieRow = memo(function TieRow({
  tie,
  closed,
  overridden,
  issues,
  editable,
  wide,
  patch,
  focused,
  testID,
}: {
  tie: TieInput;
  closed: boolean;
  overridden: boolean;
  issues: ReadonlyMap<string, string[]>;
  editable: boolean;
  wide: boolean;
  patch: Patch;
  focused: number;
  testID: string;
}) {
  const baseClosed = tieBaseClosed(tie);
  return (
    <RowFrame
      id={tie.id}
      detail={`${tie.fromBus || '—'} — ${tie.toBus || '—'} · base: ${baseClosed ? 'closed' : 'open'}`}
      changed={overridden}
      messages={[...(issues.get('') ?? []), ...(issues.get('closed') ?? [])]}
      wide={wide}
      editable={editable}
      inline
      focused={focused}
      testID={testID}
    >
      <StateField wide={wide}>
        <SegCell
          value={closed ? 'closed' : 'open'}
          options={[
            { value: 'closed', label: 'Closed' },
            { value: 'open', label: 'Open' },
          ]}
          onChange={(v) => patch((s) => setTieClosed(s, tie, v === 'closed'))}
          size={wide ? 'cell' : 'form'}
          editable={editable}
          testID={`${testID}-state`}
          accessibilityLabel={`${tie.id} in this scenario (base: ${baseClosed ? 'closed' : 'open'})`}
        />
      </StateField>
    </RowFrame>
  );
});

const MotorRow = memo(function MotorRow({
  motor,
  running,
  allOff,
  overridden,
  issues,
  editable,
  wide,
  patch,
  focused,
  testID,
}: {
  motor: MotorInput;
  running: boolean;
  allOff: boolean;
  overridden: boolean;
  issues: ReadonlyMap<string, string[]>;
  editable: boolean;
  wide: boolean;
  patch: Patch;
  focused: number;
  testID: string;
}) {
  const rating = motor.hp !== undefined ? `${num(motor.hp)} hp` : `${num(motor.kva)} kVA`;
  return (
    <RowFrame
      id={motor.id}
      detail={`At ${motor.bus || '—'} · ${rating} · ${allOff ? 'default: stopped' : 'base: running'}`}
      changed={overridden}
      messages={[...(issues.get('') ?? []), ...(issues.get('inService') ?? [])]}
      wide={wide}
      editable={editable}
      inline
      focused={focused}
      testID={testID}
    >
      <StateField wide={wide}>
        <SegCell
          value={running ? 'running' : 'stopped'}
          options={[
            { value: 'running', label: 'Running' },
            { value: 'stopped', label: 'Stopped' },
          ]}
          onChange={(v) => patch((s) => setMotorRunning(s, motor.id, v === 'running'))}
          size={wide ? 'cell' : 'form'}
          editable={editable}
          testID={`${testID}-state`}
          accessibilityLabel={`${motor.id} in this scenario`}
        />
      </StateField>
    </RowFrame>
  );
});

function OrphanRow({
  kind,
  id,
  messages,
  editable,
  patch,
  focused,
  testID,
}: {
  kind: OverrideKind;
  id: string;
  messages: string[];
  editable: boolean;
  patch: Patch;
  focused: number;
  testID: string;
}) {
  const ref = useScrollIntoView(focused);
  const what = { sources: 'Source', ties: 'Tie', motors: 'Motor' }[kind];
  return (
    <View ref={ref} testID={testID} style={styles.orphan}>
      <View style={styles.orphanText}>
        <T style={styles.orphanTitle}>
          <T style={styles.orphanId}>{id}</T>
          <T style={styles.orphanKind}>{`  ${what.toLowerCase()}`}</T>
        </T>
        <T style={styles.orphanMessage}>
          {messages.length ? messages.join(' · ') : `No ${what.toLowerCase()} "${id}" in the model`}
        </T>
      </View>
      {editable ? (
        <Button
          title="Remove"
          kind="secondary"
          onPress={() => patch((s) => clearOverride(s, kind, id))}
          testID={`${testID}-remove`}
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  /** The heading and the add button: stacked on a phone, in a row on a wide screen. */
  header: { flexDirection: 'column', alignItems: 'stretch', gap: space.md },
  headerWide: { flexDirection: 'row', alignItems: 'center' },
  headerTitle: { gap: 2 },
  headerTitleWide: { flex: 1 },
  section: { gap: space.md },
  count: { fontFamily: fonts.numbers, fontSize: 18, color: colors.muted },
  problem: { color: colors.danger, fontSize: 15 },
  listCard: { padding: 0, gap: 0, overflow: 'hidden' },
  cards: { gap: space.sm },
  /** A scenario's card (phone). */
  card: {
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    overflow: 'hidden',
  },
  cardChosen: { borderColor: colors.accent },
  cardDetail: { borderTopWidth: 1, borderTopColor: colors.lineSoft, padding: space.md },
  empty: { borderStyle: 'dashed', borderColor: colors.line, alignItems: 'flex-start' },
  listHeadCell: { paddingHorizontal: space.md, paddingVertical: space.sm },
  listHeadId: { width: LIST_ID_WIDTH + 4 },
  listHeadName: { width: LIST_NAME_WIDTH },
  listHeadSummary: { flex: 1 },
  listHeadText: { color: colors.muted },
  listHead: {
    flexDirection: 'row',
    backgroundColor: colors.canvas,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  baseCard: {
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    borderRadius: radius.md,
    backgroundColor: colors.canvas,
    gap: 2,
  },
  baseId: { fontFamily: fonts.textBold, fontSize: 16 },
  baseRow: {
    flexDirection: 'row',
    alignItems: 'center',
    minHeight: 44,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: 'transparent',
  },
  baseRowId: { width: LIST_ID_WIDTH, paddingHorizontal: space.md, fontFamily: fonts.textBold, color: colors.muted },
  baseRowName: { width: LIST_NAME_WIDTH, paddingHorizontal: space.md, color: colors.muted },
  baseRowNote: { flex: 1, paddingHorizontal: space.md },
  listRow: {
    flexDirection: 'row',
    alignItems: 'center',
    minHeight: touch.min,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
    borderLeftWidth: 4,
    borderLeftColor: 'transparent',
    backgroundColor: colors.surface,
  },
  /** The scenario open below the list. */
  listRowChosen: { borderLeftColor: colors.accent, backgroundColor: colors.accentSoft },
  listRowProblem: { borderLeftColor: colors.danger },
  listRowHovered: { backgroundColor: colors.canvas },
  listRowId: { width: LIST_ID_WIDTH, paddingHorizontal: space.md, fontFamily: fonts.textBold, fontSize: 15 },
  listRowName: { width: LIST_NAME_WIDTH, paddingHorizontal: space.md, fontSize: 15 },
  noName: { color: colors.muted, fontStyle: 'italic' },
  listRowSummary: { flex: 1, paddingHorizontal: space.md, fontSize: 14, color: colors.inkSoft },
  listRowBadge: { width: 44, alignItems: 'center' },
  cardRow: {
    minHeight: 56,
    paddingVertical: space.sm,
    paddingLeft: space.md,
    paddingRight: space.sm,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    borderLeftWidth: 4,
    borderLeftColor: colors.lineSoft,
    backgroundColor: 'transparent',
  },
  cardRowProblem: { borderLeftColor: colors.danger },
  cardRowChosen: { borderLeftColor: colors.accent },
  cardRowPressed: { backgroundColor: colors.canvas },
  cardRowText: { flex: 1, gap: 2, minWidth: 0 },
  cardRowTitle: { fontSize: 16 },
  cardRowId: { fontFamily: fonts.textBold, fontSize: 16 },
  cardRowName: { color: colors.muted, fontSize: 15 },
  cardRowSummary: { fontSize: 14, lineHeight: 19, color: colors.inkSoft },
  detail: { gap: space.lg },
  detailHead: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-start' },
  detailActions: {
    flexDirection: 'row',
    gap: space.sm,
    flexWrap: 'wrap',
    alignSelf: 'stretch',
    justifyContent: 'flex-end',
    flexGrow: 1,
  },
  detailActionsWide: { alignSelf: 'flex-end', flexGrow: 0 },
  changes: {
    backgroundColor: colors.canvas,
    borderRadius: radius.sm,
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    gap: 2,
  },
  changesLabel: { color: colors.muted },
  changesText: { fontSize: 15 },
  /** "All motors stopped" and the motor filter. */
  motorsAbove: { flexDirection: 'column', alignItems: 'stretch', justifyContent: 'space-between', gap: space.sm },
  motorsAboveWide: { flexDirection: 'row', alignItems: 'center' },
  noMotors: { padding: space.md },
  group: { gap: space.sm },
  groupHead: { gap: 2 },
  groupCount: { fontFamily: fonts.numbers, fontSize: 15, color: colors.muted },
  groupTable: {
    borderWidth: 1,
    borderColor: colors.lineSoft,
    borderRadius: radius.sm,
    overflow: 'hidden',
  },
  groupColumns: {
    flexDirection: 'row',
    gap: space.md,
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    backgroundColor: colors.canvas,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  groupElementHead: { width: TITLE_WIDTH, color: colors.muted },
  /** A column's heading; its width is the column's. */
  groupColumnHead: { color: colors.muted },
  resetPlaceholder: { width: 40 },
  rowTitle: { gap: 2, minWidth: 0 },
  rowTitleWide: { width: TITLE_WIDTH },
  rowTitlePhone: { flex: 1 },
  rowTitleText: { fontSize: 15 },
  rowTitleId: { fontFamily: fonts.textBold, fontSize: 15 },
  rowChangedWord: { color: colors.accent, fontFamily: fonts.textMedium, fontSize: 13 },
  rowErrors: { color: colors.danger, fontSize: 14 },
  /** An element's row: the bar on the left says changed (accent) or a problem (danger). */
  row: {
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.lineSoft,
    marginTop: -1,
    borderLeftWidth: 3,
    borderLeftColor: 'transparent',
    backgroundColor: colors.surface,
    gap: space.sm,
  },
  rowChanged: { borderLeftColor: colors.accent, backgroundColor: '#F3FAFA' },
  rowProblem: { borderLeftColor: colors.danger },
  rowLineWide: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  rowReset: { marginLeft: 'auto' },
  rowLine: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  rowFields: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  /** A field in a table column; its width is the column's. */
  field: { gap: 2 },
  fieldError: { color: colors.danger },
  faultRow: { flexDirection: 'row', gap: space.xs },
  faultValue: { flex: 1 },
  faultUnit: { width: 112 },
  faultUnitWide: { width: 92 },
  faultNone: { width: FAULT_WIDTH, paddingHorizontal: space.sm },
  faultNoneText: { color: colors.muted, fontSize: 14 },
  state: { width: 176, flexShrink: 0 },
  stateWide: { width: STATE_WIDTH },
  orphan: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.lineSoft,
    marginTop: -1,
    borderLeftWidth: 3,
    borderLeftColor: colors.danger,
  },
  orphanText: { flex: 1, minWidth: 0, gap: 2 },
  orphanTitle: { fontSize: 15 },
  orphanId: { fontFamily: fonts.textBold, fontSize: 15 },
  orphanKind: { color: colors.muted, fontSize: 14 },
  orphanMessage: { color: colors.danger, fontSize: 14 },
});
