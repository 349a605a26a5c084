/**
 * The system as an indented tree, from each source down to the buses it feeds, with motors and protective devices
 * marked where they sit. Connector lines are plain Views, so rows wrap and stay readable on a 390 px phone.
 */
import React, { memo, useCallback, useDeferredValue, useLayoutEffect, useMemo, useRef } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import Svg, { Circle, Line, Path, Rect } from 'react-native-svg';
import type { ModelInput } from '../../shared/schemas/model';
import { colors, fonts, radius, space } from '../theme';
import { T } from '../ui';
import { useUnitSystem } from '../../hooks/unitSystem';
import { buildSystemTree, type DeviceMarker, type ElementRef, type TreeRow } from './tree';
import { MoreRows, useRowWindow } from './editor/RowWindow';

export interface SystemTreeProps {
  model: ModelInput;
  onSelect?: (ref: { collection: string; index: number }) => void;
}

/** Width of one level of indentation; the connector of a child runs down its middle. */
const INDENT = 24;
/** Vertical position of the connector elbow: the middle of a row's first line. */
const ANCHOR = 16;
const LINE = 1.5;
const LINE_COLOR = '#A9B6C1';

export function SystemTree({ model, onSelect }: SystemTreeProps) {
  // The tree follows the editor a moment later, so typing in the editor never waits for it.
  const deferred = useDeferredValue(model);
  const { system } = useUnitSystem();
  const rows = useMemo(
    () => buildSystemTree(deferred, system).map((row) => ({ row, sig: JSON.stringify(row) })),
    [deferred, system],
  );
  // Rows keep a stable callback, so a parent passing a new arrow function each render does not redraw them all.
  const onSelectRef = useRef(onSelect);
  useLayoutEffect(() => {
    onSelectRef.current = onSelect;
  });
  const stableSelect = useCallback((ref: { collection: string; index: number }) => onSelectRef.current?.(ref), []);
  const select = onSelect ? stableSelect : undefined;
  // A large plant's tree is drawn a window of rows at a time (editor/RowWindow.tsx).
  const rowWindow = useRowWindow(rows.length, null);
  if (rows.length === 0) {
    return (
      <T variant="small" testID="system-tree">
        No sources or buses yet.
      </T>
    );
  }
  return (
    <View testID="system-tree" style={styles.tree}>
      {(rowWindow.shown < rows.length ? rows.slice(0, rowWindow.shown) : rows).map(({ row, sig }) => (
        <TreeRowView key={row.key} row={row} sig={sig} onSelect={select} />
      ))}
      <MoreRows
        shown={rowWindow.shown}
        total={rows.length}
        noun="rows"
        onMore={rowWindow.showMore}
        testID="system-tree-more"
        canFind={false}
      />
      <Legend />
    </View>
  );
}

// ---------------------------------------------------------------------------------------------
// Glyphs (24 × 20)

type GlyphKind = 'utility' | 'generator' | 'bus' | 'motor' | 'tie' | 'missing' | 'bus-seen';

function Glyph({ kind }: { kind: GlyphKind }) {
  const c = colors.ink;
  return (
    <Svg width={24} height={20} viewBox="0 0 24 20">
      {kind === 'utility' ? (
        <>
          <Circle cx={12} cy={10} r={8.5} stroke={c} strokeWidth={1.6} fill={colors.surface} />
          <Path
            d="M6.5 10c1.4-3.2 2.9-3.2 4.3 0s2.9 3.2 4.3 0 2.9-3.2 4.3 0"
            stroke={c}
            strokeWidth={1.5}
            fill="none"
            transform="translate(-1.6 0)"
          />
        </>
      ) : null}
      {kind === 'generator' || kind === 'motor' ? (
        <>
          <Circle cx={12} cy={10} r={8.5} stroke={c} strokeWidth={1.6} fill={colors.surface} />
          {/* The letter is drawn as a path, not text: a screen reader reads the row's name ("Motor P-1 …"), and the
              visible text of the row is its name alone (WCAG 2.5.3, label in name). */}
          <Path
            d={kind === 'generator' ? 'M14.8 7.2A3.9 3.9 0 1 0 15.9 10.7H12.6' : 'M8.4 14V6.2l3.6 5.1 3.6-5.1V14'}
            stroke={c}
            strokeWidth={1.7}
            strokeLinejoin="miter"
            fill="none"
          />
        </>
      ) : null}
      {kind === 'bus' || kind === 'bus-seen' ? (
        <Rect x={1} y={7} width={22} height={6} rx={1.5} fill={kind === 'bus' ? colors.accent : colors.line} />
      ) : null}
      {kind === 'tie' ? (
        <>
          <Line x1={1} y1={13} x2={8} y2={13} stroke={c} strokeWidth={1.6} />
          <Line x1={8} y1={13} x2={16} y2={5} stroke={c} strokeWidth={1.6} />
          <Line x1={16} y1={13} x2={23} y2={13} stroke={c} strokeWidth={1.6} />
          <Circle cx={8} cy={13} r={1.8} fill={c} />
          <Circle cx={16} cy={13} r={1.8} fill={c} />
        </>
      ) : null}
      {kind === 'missing' ? (
        <>
          <Circle cx={12} cy={10} r={8.5} stroke={colors.danger} strokeWidth={1.6} fill={colors.dangerSoft} />
          <Path d="M12 5.5v5.5M12 14v.01" stroke={colors.danger} strokeWidth={2} strokeLinecap="round" />
        </>
      ) : null}
    </Svg>
  );
}

// ---------------------------------------------------------------------------------------------
// Rows

function Connectors({ row }: { row: TreeRow }) {
  if (row.depth === 0) return null;
  return (
    <>
      {row.guides.map((continues, k) => (
        <View key={k} style={styles.indent}>
          {continues ? <View style={styles.guide} /> : null}
        </View>
      ))}
      <View style={styles.indent}>
        <View style={[styles.elbowDown, row.last ? styles.elbowDownLast : styles.elbowDownOn]} />
        <View style={styles.elbowAcross} />
      </View>
    </>
  );
}

function Tap({
  target,
  onSelect,
  children,
  label,
  testID,
  shrink,
}: {
  target?: ElementRef;
  onSelect?: SystemTreeProps['onSelect'];
  children: React.ReactNode;
  /** The element's kind, then the text shown inside (a name that differs from the visible text fails WCAG 2.5.3). */
  label: string;
  testID?: string;
  shrink?: boolean;
}) {
  if (!onSelect || !target) return shrink ? <View style={styles.shrink}>{children}</View> : <>{children}</>;
  return (
    <Pressable
      accessibilityRole="link"
      accessibilityLabel={label}
      onPress={() => onSelect({ collection: target.collection, index: target.index })}
      testID={testID}
      style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
        styles.tap,
        pressed || hovered ? styles.tapActive : null,
        shrink ? styles.shrink : null,
      ]}
    >
      {children}
    </Pressable>
  );
}

function DeviceChips({ devices, onSelect }: { devices: DeviceMarker[]; onSelect?: SystemTreeProps['onSelect'] }) {
  return (
    <>
      {devices.map((d) => (
        <Tap key={`${d.index}`} target={d} onSelect={onSelect} label={`Device ${d.id}`} testID={`tree-device-${d.id}`}>
          <View style={styles.chip}>
            <View style={styles.deviceMark} />
            <T style={styles.chipText}>{d.id}</T>
          </View>
        </Tap>
      ))}
    </>
  );
}

/** Second-line content of a row: indented past the connector stub that runs down to its children. */
function Detail({ children }: { children: React.ReactNode }) {
  return <View style={styles.detail}>{children}</View>;
}

const TreeRowView = memo(
  function TreeRowView({ row, onSelect }: { row: TreeRow; sig: string; onSelect?: SystemTreeProps['onSelect'] }) {
    if (row.kind === 'heading') {
      return (
        <View style={styles.heading}>
          <T
            variant="label"
            style={[
              styles.headingText,
              row.key === 'heading:islands' || row.key === 'heading:unconnected' ? styles.headingTextProblem : null,
            ]}
          >
            {row.text}
          </T>
        </View>
      );
    }
    return (
      <View
        style={[styles.row, row.depth === 0 && row.kind === 'source' ? styles.rowSource : null]}
        testID={`tree-${row.key}`}
      >
        <Connectors row={row} />
        <View style={styles.rowBody}>
          {row.hasChildren ? <View style={styles.stub} /> : null}
          <RowContent row={row} onSelect={onSelect} />
        </View>
      </View>
    );
  },
  (a, b) => a.sig === b.sig && a.onSelect === b.onSelect,
);

function Head({ glyph, children }: { glyph: GlyphKind; children: React.ReactNode }) {
  return (
    <View style={styles.head}>
      {/* The glyph repeats the kind the name already says ("Motor …"): hidden from screen readers. */}
      <View aria-hidden importantForAccessibility="no-hide-descendants">
        <Glyph kind={glyph} />
      </View>
      <T style={styles.headText}>{children}</T>
    </View>
  );
}

function RowContent({
  row,
  onSelect,
}: {
  row: Exclude<TreeRow, { kind: 'heading' }>;
  onSelect?: SystemTreeProps['onSelect'];
}) {
  switch (row.kind) {
    case 'source':
      return (
        <>
          <Tap
            target={row.ref}
            onSelect={onSelect}
            label={`Source ${row.id} ${row.text}`}
            testID={`tree-select-${row.key}`}
          >
            <Head glyph={row.label === 'GEN' ? 'generator' : 'utility'}>
              <T style={styles.id}>{row.id}</T>
              <T style={styles.muted}>{`  ${row.text}`}</T>
            </Head>
          </Tap>
          {row.devices.length || row.note ? (
            <Detail>
              <DeviceChips devices={row.devices} onSelect={onSelect} />
              {row.note ? <T style={styles.note}>{row.note}</T> : null}
            </Detail>
          ) : null}
        </>
      );
    case 'bus':
      return (
        <>
          <Tap
            target={row.ref}
            onSelect={onSelect}
            label={`Bus ${row.id} ${row.kv}${row.name ? ` ${row.name}` : ''}`}
            testID={`tree-select-${row.key}`}
          >
            <Head glyph="bus">
              <T style={styles.id}>{row.id}</T>
              <T style={styles.kv}>{`  ${row.kv}`}</T>
              {row.name ? <T style={styles.muted}>{`  ${row.name}`}</T> : null}
            </Head>
          </Tap>
          {row.via ? (
            <Detail>
              <DeviceChips devices={row.via.lineSide} onSelect={onSelect} />
              <Tap
                target={row.via}
                onSelect={onSelect}
                label={`Branch: via ${row.via.id} ${row.via.text}`}
                testID={`tree-select-${row.via.collection}[${row.via.index}]`}
                shrink
              >
                <T style={styles.via}>
                  <T style={styles.viaWord}>via </T>
                  <T style={styles.viaId}>{row.via.id}</T>
                  {`  ${row.via.text}`}
                </T>
              </Tap>
              <DeviceChips devices={row.via.loadSide} onSelect={onSelect} />
            </Detail>
          ) : null}
          {row.notes.map((n, i) => (
            <Detail key={i}>
              <T style={styles.loopNote}>{`↺ ${n}`}</T>
            </Detail>
          ))}
        </>
      );
    case 'seen-bus':
      return (
        <Tap target={row.ref} onSelect={onSelect} label={`Bus ${row.id} ${row.text}`}>
          <Head glyph="bus-seen">
            <T style={[styles.id, styles.idSeen]}>{row.id}</T>
            <T style={styles.muted}>{`  ${row.text}`}</T>
          </Head>
        </Tap>
      );
    case 'motor':
    case 'open-tie':
      return (
        <>
          <Tap
            target={row.ref}
            onSelect={onSelect}
            label={`${row.kind === 'motor' ? 'Motor' : 'Tie'} ${row.id} ${row.text}`}
            testID={`tree-select-${row.key}`}
          >
            <Head glyph={row.kind === 'motor' ? 'motor' : 'tie'}>
              <T style={[styles.id, styles.idMedium]}>{row.id}</T>
              <T style={styles.muted}>{`  ${row.text}`}</T>
            </Head>
          </Tap>
          {row.devices.length ? (
            <Detail>
              <DeviceChips devices={row.devices} onSelect={onSelect} />
            </Detail>
          ) : null}
        </>
      );
    case 'unconnected':
      return (
        <Tap target={row.ref} onSelect={onSelect} label={`${row.id} ${row.text}`} testID={`tree-select-${row.key}`}>
          <Head glyph="missing">
            <T style={styles.id}>{row.id}</T>
            <T style={styles.unconnected}>{`  ${row.text}`}</T>
          </Head>
        </Tap>
      );
  }
}

function Legend() {
  const item = (glyph: GlyphKind | 'device', text: string) => (
    <View key={text} style={styles.legendItem}>
      {glyph === 'device' ? <View style={[styles.deviceMark, styles.legendDeviceMark]} /> : <Glyph kind={glyph} />}
      <T style={styles.legendText}>{text}</T>
    </View>
  );
  return (
    <View style={styles.legend}>
      {item('utility', 'Utility')}
      {item('generator', 'Generator')}
      {item('bus', 'Bus')}
      {item('motor', 'Motor')}
      {item('tie', 'Open tie')}
      {item('device', 'Protective device')}
    </View>
  );
}

const styles = StyleSheet.create({
  tree: { gap: 0 },
  indent: { width: INDENT },
  /** Connectors: a guide down past the row for each ancestor that continues, then the elbow to the row. */
  guide: {
    position: 'absolute',
    left: INDENT / 2 - LINE / 2,
    top: 0,
    bottom: 0,
    width: LINE,
    backgroundColor: LINE_COLOR,
  },
  elbowDown: { position: 'absolute', left: INDENT / 2 - LINE / 2, top: 0, width: LINE, backgroundColor: LINE_COLOR },
  /** The last child: the line stops at the elbow. */
  elbowDownLast: { height: ANCHOR + LINE / 2 },
  elbowDownOn: { bottom: 0 },
  elbowAcross: {
    position: 'absolute',
    left: INDENT / 2,
    right: 0,
    top: ANCHOR - LINE / 2,
    height: LINE,
    backgroundColor: LINE_COLOR,
  },
  shrink: { maxWidth: '100%', flexShrink: 1 },
  tap: { borderRadius: radius.sm, backgroundColor: 'transparent' },
  /** Pressed or hovered. */
  tapActive: { backgroundColor: colors.accentSoft },
  chip: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.xs,
    height: 22,
    paddingHorizontal: 6,
    borderRadius: 4,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  deviceMark: { width: 8, height: 8, backgroundColor: colors.inkSoft, borderRadius: 1 },
  chipText: { fontSize: 12, lineHeight: 16, fontFamily: fonts.textMedium, color: colors.inkSoft },
  detail: {
    marginLeft: INDENT + space.sm,
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    columnGap: 6,
    rowGap: space.xs,
  },
  heading: {
    paddingTop: space.lg,
    paddingBottom: space.xs,
    borderTopWidth: 1,
    borderTopColor: colors.lineSoft,
    marginTop: space.sm,
  },
  headingText: { textTransform: 'uppercase', color: colors.inkSoft },
  /** Islands and unconnected elements. */
  headingTextProblem: { color: colors.danger },
  row: { flexDirection: 'row', marginTop: 0 },
  /** A source at the top level: a little space above it. */
  rowSource: { marginTop: space.xs },
  rowBody: { flex: 1, minWidth: 0, paddingTop: 6, paddingBottom: 6, gap: 3 },
  /** The line from a row down to its children. */
  stub: {
    position: 'absolute',
    left: INDENT / 2 - LINE / 2,
    top: ANCHOR + 10,
    bottom: 0,
    width: LINE,
    backgroundColor: LINE_COLOR,
  },
  head: { flexDirection: 'row', alignItems: 'flex-start', gap: space.sm, minHeight: 20 },
  headText: { flex: 1, fontSize: 15, lineHeight: 20 },
  id: { fontFamily: fonts.textBold, fontSize: 15, color: colors.ink },
  /** A bus met again (shown in full once). */
  idSeen: { color: colors.inkSoft },
  idMedium: { fontFamily: fonts.textMedium },
  muted: { fontSize: 14, color: colors.muted },
  note: { fontSize: 13, color: colors.danger },
  kv: { fontFamily: fonts.numbers, fontSize: 14, color: colors.accent },
  via: { fontSize: 13, lineHeight: 18, color: colors.inkSoft, paddingHorizontal: 2 },
  viaWord: { fontSize: 13, color: colors.muted },
  viaId: { fontSize: 13, fontFamily: fonts.textBold, color: colors.inkSoft },
  loopNote: { fontSize: 13, lineHeight: 18, color: colors.caution },
  unconnected: { fontSize: 14, color: colors.danger },
  legend: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    columnGap: space.md,
    rowGap: space.xs,
    marginTop: space.md,
    paddingTop: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.lineSoft,
  },
  legendItem: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  legendDeviceMark: { marginHorizontal: space.xs },
  legendText: { fontSize: 12, color: colors.muted },
});
