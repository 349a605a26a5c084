/** One collection: toolbar, then table rows (wide) or cards (phone). */
import { useMemo } from 'react';
import { Pressable, StyleSheet, TextInput, View } from 'react-native';
import type { ModelInput } from '../../../shared/schemas/model';
import { colors, fonts, radius, space, touch } from '../../theme';
import { Card, T } from '../../ui';
import { COLUMNS, type Column, type EditorContext } from '../columns';
import { Icon, IconButton } from '../controls';
import { type NewVariant } from '../edit';
import {
  COLLECTION_LABELS,
  elementKey,
  groupIssues,
  issueMessage,
  itemsOf,
  searchText,
  type AnyElement,
  type CollectionKey,
} from '../summaries';
import { CardRow } from './CardsView';
import { MoreRows, useRowWindow } from './RowWindow';
import { SideScroll } from './SideScroll';
import { TableHeader, TableRow } from './TableView';
import { type Focus, NO_ISSUES, type RowActions, SECTION_NOTES } from './types';

interface SectionProps {
  collection: CollectionKey;
  model: ModelInput;
  grouped: ReturnType<typeof groupIssues>;
  /** Plausibility warnings, grouped like the issues. */
  warnings?: ReturnType<typeof groupIssues>;
  ctx: EditorContext;
  editable: boolean;
  wide: boolean;
  expanded: Set<string>;
  focus: Focus | null;
  actions: RowActions;
  filter: string;
  setFilter: (s: string) => void;
  onAdd: (collection: CollectionKey, variant?: NewVariant) => void;
  /** The heading above the toolbar even on a wide screen (a panel beside the section leaves it narrow). */
  stackHeader?: boolean;
}

export function CollectionSection({
  collection,
  model,
  grouped,
  warnings,
  ctx,
  editable,
  wide,
  expanded,
  focus,
  actions,
  filter,
  setFilter,
  onAdd,
  stackHeader = false,
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
  // A long collection is drawn a window at a time (RowWindow.tsx); the row the editor jumps to is always drawn.
  const prefix = elementKey(collection, 0).slice(0, -2);
  const focusedIndex =
    focus && focus.key.startsWith(prefix) && focus.key.endsWith(']') ? Number(focus.key.slice(prefix.length, -1)) : -1;
  const rowWindow = useRowWindow(
    indexes.length,
    `${collection}\n${q}`,
    focusedIndex >= 0 ? indexes.indexOf(focusedIndex) : -1,
  );
  const drawn = rowWindow.shown < indexes.length ? indexes.slice(0, rowWindow.shown) : indexes;
  const more = (
    <MoreRows
      shown={rowWindow.shown}
      total={indexes.length}
      noun={labels.plural.toLowerCase()}
      onMore={rowWindow.showMore}
      testID={`model-more-${collection}`}
    />
  );

  const addButtons = editable ? (
    collection === 'sources' ? (
      <View style={styles.addButtons}>
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
    <View style={styles.section} testID={`model-section-body-${collection}`}>
      <View style={[styles.header, wide ? (stackHeader ? styles.headerStacked : styles.headerRow) : null]}>
        <View style={[styles.headerTitle, wide && !stackHeader ? styles.headerTitleRow : null]}>
          <T variant="heading">
            {labels.plural} <T style={styles.count}>{items.length}</T>
          </T>
          <T variant="small">{SECTION_NOTES[collection]}</T>
        </View>
        {items.length > 6 ? (
          <FilterBox value={filter} onChange={setFilter} wide={wide} label={`Find ${labels.plural.toLowerCase()}`} />
        ) : null}
        {addButtons}
      </View>
      {sectionIssues.map((li, i) => (
        <T key={i} style={styles.problem}>
          {issueMessage(li.issue)}
        </T>
      ))}
      {items.length === 0 ? (
        <Card style={styles.empty}>
          <T variant="small">{`No ${labels.plural.toLowerCase()} yet.`}</T>
        </Card>
      ) : indexes.length === 0 ? (
        <T variant="small">{`No ${labels.plural.toLowerCase()} match “${filter}”.`}</T>
      ) : wide ? (
        <Card style={styles.tableCard}>
          <SideScroll testID={`table-${collection}`}>
            <View style={styles.table}>
              <TableHeader columns={columns} />
              {drawn.map((i) => {
                const key = elementKey(collection, i);
                return (
                  <TableRow
                    key={key}
                    collection={collection}
                    index={i}
                    element={items[i]}
                    issues={grouped.byElement.get(key) ?? NO_ISSUES}
                    warnings={warnings?.byElement.get(key) ?? NO_ISSUES}
                    ctx={ctx}
                    editable={editable}
                    focused={focus?.key === key ? focus.nonce : 0}
                    actions={actions}
                  />
                );
              })}
            </View>
          </SideScroll>
          {more}
        </Card>
      ) : (
        <View style={styles.cards}>
          {drawn.map((i) => {
            const key = elementKey(collection, i);
            return (
              <CardRow
                key={key}
                collection={collection}
                index={i}
                element={items[i]}
                issues={grouped.byElement.get(key) ?? NO_ISSUES}
                warnings={warnings?.byElement.get(key) ?? NO_ISSUES}
                ctx={ctx}
                editable={editable}
                focused={focus?.key === key ? focus.nonce : 0}
                expanded={expanded.has(key)}
                actions={actions}
              />
            );
          })}
          {more}
        </View>
      )}
    </View>
  );
}

export function AddButton({ title, onPress, testID }: { title: string; onPress: () => void; testID: string }) {
  return (
    <Pressable
      accessibilityRole="button"
      onPress={onPress}
      testID={testID}
      style={({ pressed }) => [styles.addButton, pressed ? styles.addButtonPressed : null]}
    >
      <Icon name="plus" size={18} color={colors.accentInk} />
      <T style={styles.addButtonText}>{title}</T>
    </Pressable>
  );
}

export function FilterBox({
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
    <View style={[styles.filter, wide ? styles.filterWide : null]}>
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
        style={styles.filterInput}
      />
      {value ? <IconButton icon="close" label="Clear" size={32} onPress={() => onChange('')} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  addButtons: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  section: { gap: space.md },
  /** The heading, the filter and the add buttons: stacked on a phone, in a row on a wide screen unless asked. */
  header: { flexDirection: 'column', alignItems: 'stretch', gap: space.md },
  headerRow: { flexDirection: 'row', alignItems: 'center' },
  headerStacked: { alignItems: 'flex-start' },
  headerTitle: { gap: 2 },
  headerTitleRow: { flex: 1 },
  count: { fontFamily: fonts.numbers, fontSize: 18, color: colors.muted },
  problem: { color: colors.danger, fontSize: 15 },
  empty: { borderStyle: 'dashed', borderColor: colors.line, alignItems: 'flex-start' },
  tableCard: { padding: 0, gap: 0, overflow: 'hidden' },
  table: { minWidth: '100%' },
  cards: { gap: space.sm },
  addButton: {
    minHeight: touch.min,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    backgroundColor: colors.accent,
    flexDirection: 'row',
    alignItems: 'center',
    justifyContent: 'center',
    gap: space.sm,
    opacity: 1,
  },
  addButtonPressed: { opacity: 0.85 },
  addButtonText: { color: colors.accentInk, fontFamily: fonts.textBold, fontSize: 16 },
  filter: {
    height: touch.min,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    borderWidth: 1.5,
    borderColor: colors.line,
    borderRadius: radius.sm,
    paddingHorizontal: space.md,
    backgroundColor: colors.surface,
  },
  filterWide: { width: 240 },
  filterInput: { flex: 1, height: '100%', minWidth: 0, fontSize: 16, fontFamily: fonts.text, color: colors.ink },
});
