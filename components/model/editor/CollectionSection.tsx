/** One collection: toolbar, then table rows (wide) or cards (phone). */
import { useMemo } from 'react';
import { Pressable, TextInput, View } from 'react-native';
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
      <View
        style={{
          flexDirection: wide && !stackHeader ? 'row' : 'column',
          alignItems: wide ? (stackHeader ? 'flex-start' : 'center') : 'stretch',
          gap: space.md,
        }}
      >
        <View style={{ flex: wide && !stackHeader ? 1 : undefined, gap: 2 }}>
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
          <SideScroll testID={`table-${collection}`}>
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
                warnings={warnings?.byElement.get(key) ?? NO_ISSUES}
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

export function AddButton({ title, onPress, testID }: { title: string; onPress: () => void; testID: string }) {
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
