import React from 'react';
import { FlatList, ScrollView, StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import { useDocumentTitle } from '../../hooks/useDocumentTitle';
import { colors, space } from '../theme';
import { T } from './Text';

interface ScreenProps {
  title: string;
  /** The browser tab's name for the page when the heading is not a good one (default: the heading). */
  documentTitle?: string;
  subtitle?: string;
  actions?: React.ReactNode;
  children: React.ReactNode;
  maxWidth?: number;
}

function ScreenHeading({
  title,
  subtitle,
  actions,
  wide,
}: Pick<ScreenProps, 'title' | 'subtitle' | 'actions'> & { wide: boolean }) {
  return (
    <View style={[styles.heading, wide && styles.headingWide]}>
      <View style={styles.titles}>
        <T variant="title" accessibilityRole="header">
          {title}
        </T>
        {subtitle ? <T variant="small">{subtitle}</T> : null}
      </View>
      {actions ? <View style={styles.actions}>{actions}</View> : null}
    </View>
  );
}

/** A scrolling page with a title; wide screens get a readable maximum width. */
export function Screen({ title, subtitle, actions, children, maxWidth = 1200, documentTitle }: ScreenProps) {
  const { wide } = useLayout();
  useDocumentTitle(documentTitle ?? title);
  return (
    // The page's main landmark; focusable so a keyboard can scroll it when it holds no control (axe:
    // scrollable-region-focusable).
    <ScrollView
      role="main"
      focusable
      style={styles.page}
      contentContainerStyle={[styles.pageContent, wide && styles.pageContentWide]}
    >
      <View style={[styles.column, styles.columnStack, { maxWidth }]}>
        <ScreenHeading title={title} subtitle={subtitle} actions={actions} wide={wide} />
        {children}
      </View>
    </ScrollView>
  );
}

/**
 * A Screen whose long list is virtualized: the page scrolls as one FlatList (heading and `children` above the rows,
 * `footer` below), so only the rows near the viewport are mounted. A FlatList inside a Screen's ScrollView would not
 * virtualize.
 */
export function ListScreen<Item>({
  title,
  subtitle,
  actions,
  children,
  maxWidth = 1200,
  documentTitle,
  data,
  keyExtractor,
  renderItem,
  footer,
  initialNumToRender = 30,
  listTestID,
  numColumns = 1,
}: ScreenProps & {
  data: readonly Item[];
  keyExtractor: (item: Item) => string;
  renderItem: (item: Item, index: number) => React.ReactElement;
  footer?: React.ReactNode;
  /** Rows mounted at first (and per batch afterwards): a page of the list is a good size. */
  initialNumToRender?: number;
  /** A test id on the scrolling list (it holds the heading, the rows and the footer). */
  listTestID?: string;
  /** Items side by side (a grid of cards); each row of the grid is as wide as the page column. */
  numColumns?: number;
}) {
  const { wide } = useLayout();
  useDocumentTitle(documentTitle ?? title);
  const column = [styles.column, { maxWidth }];
  const grid = numColumns > 1;
  return (
    <FlatList
      // FlatList cannot change its column count in place: a new count is a new list.
      key={`columns-${numColumns}`}
      numColumns={numColumns}
      columnWrapperStyle={grid ? [column, styles.gridRow] : undefined}
      role="main"
      focusable
      style={styles.page}
      contentContainerStyle={[styles.pageContent, wide && styles.pageContentWide]}
      testID={listTestID}
      data={data}
      // Rows may draw differently by width and by position (the first and last close a card): redraw on either change.
      extraData={`${wide}:${data.length}`}
      keyExtractor={keyExtractor}
      renderItem={({ item, index }) => <View style={grid ? styles.gridCell : column}>{renderItem(item, index)}</View>}
      initialNumToRender={initialNumToRender}
      maxToRenderPerBatch={initialNumToRender}
      ListHeaderComponent={
        <View style={[column, styles.columnStack]}>
          <ScreenHeading title={title} subtitle={subtitle} actions={actions} wide={wide} />
          {children}
        </View>
      }
      ListFooterComponent={footer ? <View style={[column, styles.footer]}>{footer}</View> : null}
    />
  );
}

const styles = StyleSheet.create({
  /** The title and the actions: stacked on a phone, side by side on a wide screen. */
  heading: { flexDirection: 'column', justifyContent: 'space-between', gap: space.md, alignItems: 'stretch' },
  headingWide: { flexDirection: 'row', alignItems: 'flex-end' },
  titles: { gap: space.xs, flexShrink: 1 },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  page: { flex: 1, backgroundColor: colors.canvas },
  pageContent: { padding: space.lg, paddingBottom: 96 },
  pageContentWide: { padding: space.xxl, paddingBottom: 96 },
  /** The page column, centred; its maximum width comes from the caller. */
  column: { width: '100%', alignSelf: 'center' },
  columnStack: { gap: space.lg },
  gridRow: { gap: space.md },
  gridCell: { flex: 1 },
  footer: { paddingTop: space.lg },
});
