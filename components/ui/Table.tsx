import type { AppHref } from '../nav';
import { Link } from 'expo-router';
import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

export interface TableColumn {
  key: string;
  label: string;
  /** Share of the width (default 1). */
  flex?: number;
  /** Numbers: tabular figures, right-aligned. */
  numeric?: boolean;
  /** Tabular figures, left-aligned (dates, codes). */
  mono?: boolean;
}

export interface TableRow {
  key: string;
  /** Where the row goes when pressed. */
  href?: AppHref;
  testID?: string;
  cells: Record<string, React.ReactNode>;
}

function Cell({ value, column }: { value: React.ReactNode; column: TableColumn }) {
  const style = [styles.cell, { flex: column.flex ?? 1 }];
  if (value === null || value === undefined || value === '') {
    return (
      <T variant="small" style={[style, column.numeric && styles.right]}>
        —
      </T>
    );
  }
  if (typeof value === 'string' || typeof value === 'number') {
    return (
      <T
        style={[
          style,
          styles.cellText,
          (column.numeric || column.mono) && styles.cellFigures,
          column.numeric && styles.right,
        ]}
      >
        {String(value)}
      </T>
    );
  }
  return <View style={style}>{value}</View>;
}

/** A table's header row (column names). */
export function TableHead({ columns }: { columns: TableColumn[] }) {
  return (
    <View style={styles.head}>
      {columns.map((c) => (
        <T
          key={c.key}
          variant="label"
          style={[styles.headCell, { flex: c.flex ?? 1, textAlign: c.numeric ? 'right' : 'left' }]}
        >
          {c.label.toUpperCase()}
        </T>
      ))}
    </View>
  );
}

/** One row of a table: a link when it has somewhere to go. */
export function TableRowView({ row, columns }: { row: TableRow; columns: TableColumn[] }) {
  const content = columns.map((c) => <Cell key={c.key} value={row.cells[c.key]} column={c} />);
  if (!row.href) {
    return (
      <View testID={row.testID} style={styles.row}>
        {content}
      </View>
    );
  }
  return (
    <Link href={row.href} asChild>
      <Pressable accessibilityRole="link" testID={row.testID} style={styles.row}>
        {content}
      </Pressable>
    </Link>
  );
}

/** The frame of row `index` of `count` when a table's rows are items of a virtualized list (see ListScreen). */
export function tableRowFrame(index: number, count: number) {
  return {
    backgroundColor: colors.surface,
    borderLeftWidth: 1,
    borderRightWidth: 1,
    borderColor: colors.lineSoft,
    ...(index === count - 1
      ? {
          borderBottomWidth: 1,
          borderBottomLeftRadius: radius.lg,
          borderBottomRightRadius: radius.lg,
          overflow: 'hidden' as const,
        }
      : {}),
  };
}

/** A table head as the last thing above a virtualized list of its rows (see tableRowFrame). */
export function TableTop({ columns, testID }: { columns: TableColumn[]; testID?: string }) {
  return (
    <View testID={testID} style={styles.top}>
      <TableHead columns={columns} />
    </View>
  );
}

/** A table for wide screens: a header row and rows that may each open a page. Phones show cards instead. */
export function Table({
  columns,
  rows,
  testID,
  empty,
}: {
  columns: TableColumn[];
  rows: TableRow[];
  testID?: string;
  empty?: React.ReactNode;
}) {
  return (
    <View testID={testID} style={styles.table}>
      <TableHead columns={columns} />
      {rows.length === 0 && empty ? <View style={styles.empty}>{empty}</View> : null}
      {rows.map((r) => (
        <TableRowView key={r.key} row={r} columns={columns} />
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  cell: { paddingRight: space.sm },
  /** A cell's words or numbers (numbers and codes in tabular figures). */
  cellText: { fontSize: 15 },
  cellFigures: { fontFamily: fonts.numbers, fontSize: 14 },
  right: { textAlign: 'right' },
  /** One row; the same plain entry whether a View or the child of a `Link asChild`. */
  row: {
    flexDirection: 'row',
    minHeight: touch.min,
    alignItems: 'center',
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  head: {
    flexDirection: 'row',
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  headCell: { paddingRight: space.sm },
  top: {
    backgroundColor: colors.surface,
    borderTopLeftRadius: radius.lg,
    borderTopRightRadius: radius.lg,
    borderTopWidth: 1,
    borderLeftWidth: 1,
    borderRightWidth: 1,
    borderColor: colors.lineSoft,
  },
  table: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.lineSoft },
  empty: { padding: space.lg },
});
