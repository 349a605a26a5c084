import type { AppHref } from '../nav';
import { Link } from 'expo-router';
import React from 'react';
import { Pressable, View } from 'react-native';
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
  const style = { flex: column.flex ?? 1, paddingRight: space.sm };
  if (value === null || value === undefined || value === '') {
    return (
      <T variant="small" style={[style, column.numeric ? { textAlign: 'right' } : null]}>
        —
      </T>
    );
  }
  if (typeof value === 'string' || typeof value === 'number') {
    return (
      <T
        style={[
          style,
          { fontSize: 15 },
          column.numeric || column.mono ? { fontFamily: fonts.numbers, fontSize: 14 } : null,
          column.numeric ? { textAlign: 'right' } : null,
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
    <View
      style={{
        flexDirection: 'row',
        paddingHorizontal: space.lg,
        paddingVertical: space.md,
        borderBottomWidth: 1,
        borderBottomColor: colors.line,
      }}
    >
      {columns.map((c) => (
        <T
          key={c.key}
          variant="label"
          style={{ flex: c.flex ?? 1, paddingRight: space.sm, textAlign: c.numeric ? 'right' : 'left' }}
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
  const rowStyle = {
    flexDirection: 'row' as const,
    minHeight: touch.min,
    alignItems: 'center' as const,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  };
  if (!row.href) {
    return (
      <View testID={row.testID} style={rowStyle}>
        {content}
      </View>
    );
  }
  return (
    <Link href={row.href} asChild>
      <Pressable accessibilityRole="link" testID={row.testID} style={rowStyle}>
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
    <View
      testID={testID}
      style={{
        backgroundColor: colors.surface,
        borderTopLeftRadius: radius.lg,
        borderTopRightRadius: radius.lg,
        borderTopWidth: 1,
        borderLeftWidth: 1,
        borderRightWidth: 1,
        borderColor: colors.lineSoft,
      }}
    >
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
    <View
      testID={testID}
      style={{ backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.lineSoft }}
    >
      <TableHead columns={columns} />
      {rows.length === 0 && empty ? <View style={{ padding: space.lg }}>{empty}</View> : null}
      {rows.map((r) => (
        <TableRowView key={r.key} row={r} columns={columns} />
      ))}
    </View>
  );
}
