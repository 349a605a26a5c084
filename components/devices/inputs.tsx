import React, { useEffect, useRef, useState } from 'react';
import { Platform, StyleSheet, View, type ViewStyle } from 'react-native';
import { fmt } from '../../hooks/units';
import { space } from '../theme';
import { Field, T } from '../ui';

const parseNum = (s: string): number | undefined => {
  const t = s.trim().replace(',', '.');
  if (t === '') return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : NaN;
};

/** A numeric field that keeps what is typed and reports a number (undefined when empty, NaN when not a number). */
export function NumberInput({
  label,
  unit,
  value,
  onChange,
  error,
  hint,
  editable = true,
  testID,
  style,
}: {
  label: string;
  unit?: string;
  value: number | undefined;
  onChange: (v: number | undefined) => void;
  error?: string;
  hint?: string;
  editable?: boolean;
  testID?: string;
  style?: ViewStyle;
}) {
  const [text, setText] = useState(value === undefined ? '' : String(value));
  const last = useRef(value);
  useEffect(() => {
    if (value !== last.current) {
      last.current = value;
      setText(value === undefined ? '' : String(value));
    }
  }, [value]);
  const parsed = parseNum(text);
  return (
    <Field
      label={label}
      unit={unit}
      numeric
      testID={testID}
      value={text}
      editable={editable}
      onChangeText={(t) => {
        setText(t);
        const v = parseNum(t);
        last.current = v;
        onChange(v);
      }}
      error={error ?? (parsed !== undefined && Number.isNaN(parsed) ? 'Enter a number' : undefined)}
      hint={hint}
      containerStyle={style ?? styles.numberInput}
    />
  );
}

export type Points = [number, number][];

export function pointsToText(points: readonly (readonly [number, number])[] | undefined): string {
  return (points ?? []).map(([x, y]) => `${x}, ${y}`).join('\n');
}

/** "current, seconds" per line → points, or the first problem by line. */
export function textToPoints(text: string): { points: Points } | { error: string } {
  const points: Points = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].trim();
    if (!line) continue;
    const cells = line.split(/[,;\t ]+/).filter(Boolean);
    if (cells.length !== 2) return { error: `Line ${i + 1}: give two numbers, current and seconds` };
    const [x, y] = cells.map(Number);
    if (!(x > 0) || !(y > 0)) return { error: `Line ${i + 1}: both numbers must be positive` };
    points.push([x, y]);
  }
  return { points };
}

/** A point list as text, one "current, seconds" pair per line. */
export function PointsInput({
  label,
  value,
  onChange,
  error,
  editable = true,
  testID,
}: {
  label: string;
  value: readonly (readonly [number, number])[] | undefined;
  onChange: (points: Points | undefined) => void;
  error?: string;
  editable?: boolean;
  testID?: string;
}) {
  const [text, setText] = useState(pointsToText(value));
  const [localError, setLocalError] = useState<string | undefined>();
  const last = useRef(value);
  useEffect(() => {
    if (value !== last.current) {
      last.current = value;
      setText(pointsToText(value));
    }
  }, [value]);
  const count = text.split(/\r?\n/).filter((l) => l.trim()).length;
  return (
    <View style={styles.points}>
      <Field
        label={label}
        testID={testID}
        value={text}
        editable={editable}
        multiline
        numeric
        onChangeText={(t) => {
          setText(t);
          const r = textToPoints(t);
          if ('error' in r) {
            setLocalError(r.error);
            return;
          }
          setLocalError(undefined);
          const pts = r.points.length ? r.points : undefined;
          last.current = pts;
          onChange(pts);
        }}
        error={localError ?? error}
        hint={`${count} point${count === 1 ? '' : 's'}: current, seconds per line`}
        style={styles.pointsInput}
      />
    </View>
  );
}

/** A web file picker (the app runs on the web target); on other platforms it says so. */
export function FilePicker({ accept, onFile, label }: { accept: string; onFile: (file: File) => void; label: string }) {
  if (Platform.OS !== 'web') return <T variant="small">File upload is available in the web app.</T>;
  return (
    <View style={styles.filePicker}>
      <T variant="label">{label}</T>
      {React.createElement('input', {
        type: 'file',
        accept,
        'data-testid': 'file-input',
        onChange: (e: { target: { files?: FileList | null; value: string } }) => {
          const f = e.target.files?.[0];
          if (f) onFile(f);
          e.target.value = '';
        },
        style: { fontSize: 15, padding: 8 },
      })}
    </View>
  );
}

export { fmt };

const styles = StyleSheet.create({
  numberInput: { flexGrow: 1, flexBasis: 150 },
  points: { flexGrow: 1, flexBasis: 220, gap: 2 },
  pointsInput: { minHeight: 140, textAlignVertical: 'top', paddingTop: space.sm },
  filePicker: { gap: space.xs },
});
