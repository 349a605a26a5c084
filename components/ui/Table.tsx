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
      {rows.length === 0 && empty ? <View style={{ padding: space.lg }}>{empty}</View> : null}
      {rows.map((r) => {
        const content = columns.map((c) => <Cell key={c.key} value={r.cells[c.key]} column={c} />);
        const rowStyle = {
          flexDirection: 'row' as const,
          minHeight: touch.min,
          alignItems: 'center' as const,
          paddingHorizontal: space.lg,
          paddingVertical: space.sm,
          borderBottomWidth: 1,
          borderBottomColor: colors.lineSoft,
        };
        if (!r.href) {
          return (
            <View key={r.key} testID={r.testID} style={rowStyle}>
              {content}
            </View>
          );
        }
        return (
          <Link key={r.key} href={r.href} asChild>
            <Pressable accessibilityRole="link" testID={r.testID} style={rowStyle}>
              {content}
            </Pressable>
          </Link>
        );
      })}
    </View>
  );
}
