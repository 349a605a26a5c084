import { useQuery } from '@tanstack/react-query';
import { useRouter } from 'expo-router';
import React, { useEffect, useMemo, useRef, useState } from 'react';
import {
  type GestureResponderEvent,
  type LayoutChangeEvent,
  PanResponder,
  Platform,
  Pressable,
  StyleSheet,
  View,
} from 'react-native';
import Svg, { Circle, G, Polyline, Rect, Text as SvgText } from 'react-native-svg';
import { contract } from '../../shared/api';
import type { Box, DrawnElement, OneLineDrawing, Shape, Tone } from '../../shared/oneLine/geometry';
import { textWidth, toggleText } from '../../shared/oneLine/geometry';
import type { StudyDto } from '../../shared/schemas/studies';
import { callApi } from '../../hooks/api';
import { queryKeys } from '../../hooks/queryKeys';
import { colors, space } from '../theme';
import { Button, Choice, Field, Notice, T } from '../ui';

const PALETTE: Record<Tone, string> = {
  ink: colors.ink,
  muted: colors.muted,
  accent: colors.accent,
  danger: colors.danger,
  caution: colors.caution,
  problem: colors.danger,
  surface: colors.surface,
};

/** A device's kind in words, for its accessibility label. */
const DEVICE_WORDS: Record<NonNullable<DrawnElement['deviceKind']>, string> = {
  relay: 'relay',
  fuse: 'fuse',
  'thermal-magnetic': 'thermal-magnetic breaker',
  electronic: 'electronic trip unit',
  band: 'digitized band',
};
export const deviceA11yLabel = (e: DrawnElement) =>
  `Device ${e.id}${e.deviceKind ? `, ${DEVICE_WORDS[e.deviceKind]}` : ''} — open its band`;

/** A collapsed subtree's box in words: what it holds, its highest energy with its signal word, and what a tap does. */
export const summaryA11yLabel = (e: DrawnElement) => {
  const texts = e.shapes.flatMap((x) => (x.t === 'text' ? [x.text] : []));
  return `${texts.join('; ')} — expand`;
};

const MIN_SCALE = 0.03;
const MAX_SCALE = 4;

interface View2D {
  s: number;
  tx: number;
  ty: number;
}

/** Where a tap finds an element: its symbol, and for a bus its label too (a larger target). */
function hitBox(e: DrawnElement): Box {
  let x0 = e.box.x;
  let y0 = e.box.y;
  let x1 = e.box.x + e.box.w;
  let y1 = e.box.y + e.box.h;
  for (const s of e.shapes) {
    if (s.t !== 'text') continue;
    x0 = Math.min(x0, s.x);
    x1 = Math.max(x1, s.x + textWidth(s.text, s.size));
    y0 = Math.min(y0, s.y - s.size);
    y1 = Math.max(y1, s.y + 3);
  }
  return { x: x0 - 4, y: y0 - 4, w: x1 - x0 + 8, h: y1 - y0 + 8 };
}

function ShapeView({ s }: { s: Shape }) {
  const dash = 'dashed' in s && s.dashed ? '5 4' : undefined;
  switch (s.t) {
    case 'line': {
      const pts: string[] = [];
      for (let i = 0; i < s.pts.length; i += 2) pts.push(`${s.pts[i]},${s.pts[i + 1]}`);
      return (
        <Polyline
          points={pts.join(' ')}
          fill="none"
          stroke={PALETTE[s.tone]}
          strokeWidth={s.width}
          strokeDasharray={dash}
        />
      );
    }
    case 'rect':
      return (
        <Rect
          x={s.x}
          y={s.y}
          width={s.w}
          height={s.h}
          fill={s.fill ? PALETTE[s.fill] : 'none'}
          stroke={PALETTE[s.tone]}
          strokeWidth={s.halo ? 0 : 1.5}
          strokeDasharray={dash}
        />
      );
    case 'circle':
      return (
        <Circle
          cx={s.cx}
          cy={s.cy}
          r={s.r}
          fill={s.fill ? PALETTE[s.fill] : 'none'}
          stroke={PALETTE[s.tone]}
          strokeWidth={1.5}
          strokeDasharray={dash}
        />
      );
    case 'text':
      return (
        <SvgText
          x={s.x}
          y={s.y}
          fontSize={s.size}
          textAnchor={s.anchor}
          fill={PALETTE[s.tone]}
          fontWeight={s.bold ? '600' : '400'}
          fontFamily="Inter, Arial, sans-serif"
        >
          {s.text}
        </SvgText>
      );
  }
}

const touchDistance = (e: GestureResponderEvent) => {
  const [a, b] = e.nativeEvent.touches;
  return a && b ? Math.hypot(a.pageX - b.pageX, a.pageY - b.pageY) : 0;
};

/**
 * The study's one-line diagram (shared/oneLine, the same geometry as the SVG route): pan by dragging, zoom by pinching
 * (phone), the buttons or the mouse wheel (web); tap a bus for its clearing trace, a device or branch for the trace
 * of the bus it protects; find an element by id.
 */
export function OneLinePanel({ study }: { study: StudyDto }) {
  const router = useRouter();
  const [scenario, setScenario] = useState('base');
  // The collapsed buses (null: the server's default for the model's size, e.g. a large plant opens collapsed).
  const [collapsed, setCollapsed] = useState<string[] | null>(null);
  const drawing = useQuery({
    queryKey: [...queryKeys.studies.detail(study.id), 'one-line', scenario, collapsed],
    queryFn: () =>
      callApi(contract.oneLine.drawing, {
        params: { studyId: study.id },
        query: {
          ...(scenario === 'base' ? {} : { scenario }),
          ...(collapsed === null ? {} : collapsed.length ? { collapsed } : { expanded: 'all' as const }),
        },
      }),
    placeholderData: (previous) => previous,
  });
  const [size, setSize] = useState({ w: 0, h: 0 });
  const [view, setView] = useState<View2D | null>(null);
  const [search, setSearch] = useState('');
  const [found, setFound] = useState<{ id: string; message?: string } | null>(null);
  const d = drawing.data as (OneLineDrawing & { title: string; scenarios: { id: string; name: string }[] }) | undefined;
  const hits = useMemo(() => (d ? d.elements.map((e) => ({ e, b: hitBox(e) })) : []), [d]);

  // First view: the top of the drawing (the sources), fitted to the width but not smaller than readable.
  const initial: View2D | null =
    d && size.w
      ? (() => {
          const s = Math.min(1, Math.max(0.6, (size.w - 16) / d.width));
          return { s, tx: Math.max(8, (size.w - d.width * s) / 2), ty: 8 };
        })()
      : null;
  const current = view ?? initial;
  const viewRef = useRef<View2D | null>(null);
  const zoomAt = (factor: number, px: number, py: number) =>
    setView((prev) => {
      const v = prev ?? viewRef.current;
      if (!v) return prev;
      const s = Math.min(MAX_SCALE, Math.max(MIN_SCALE, v.s * factor));
      return { s, tx: px - ((px - v.tx) * s) / v.s, ty: py - ((py - v.ty) * s) / v.s };
    });

  // After a collapse or an expand, the bus toggled stays where it was on the screen.
  const [anchor, setAnchor] = useState<{ id: string; sx: number; sy: number } | null>(null);
  const toggle = (busId: string) => {
    if (!d || !current) return;
    const bus = d.elements.find((x) => x.id === busId);
    if (bus) setAnchor({ id: busId, sx: current.tx + bus.box.x * current.s, sy: current.ty + bus.box.y * current.s });
    setFound(null);
    const now = d.collapsed;
    setCollapsed(now.includes(busId) ? now.filter((x) => x !== busId) : [...now, busId]);
  };
  // Once the drawing after a toggle has come, move it so that the bus is back where it was.
  if (anchor && d && current && !drawing.isPlaceholderData) {
    const bus = d.elements.find((x) => x.id === anchor.id);
    setAnchor(null);
    if (bus) setView({ s: current.s, tx: anchor.sx - bus.box.x * current.s, ty: anchor.sy - bus.box.y * current.s });
  }

  const open = (e: DrawnElement) => {
    // A collapsed subtree's box: expand it.
    if (e.kind === 'summary' && e.summary) {
      toggle(e.summary.of);
      return;
    }
    // A device: its settings and band (the model's device editor); anything else: the clearing trace of its bus.
    if (e.kind === 'device') {
      router.push(`/studies/${study.id}?tab=model&device=${encodeURIComponent(e.id)}`);
      return;
    }
    const bus = e.kind === 'bus' ? e.id : e.busId;
    if (bus) router.push(`/studies/${study.id}/bus/${encodeURIComponent(bus)}`);
  };
  const tapAt = (x: number, y: number) => {
    const v = viewRef.current;
    if (!v) return;
    const dx = (x - v.tx) / v.s;
    const dy = (y - v.ty) / v.s;
    // Symbols first (devices sit near bus labels), then buses.
    const inside = hits.filter(({ b }) => dx >= b.x && dx <= b.x + b.w && dy >= b.y && dy <= b.y + b.h);
    const pick = inside.find((h) => h.e.kind !== 'bus') ?? inside[0];
    if (pick) open(pick.e);
  };
  const tapRef = useRef(tapAt);
  useEffect(() => {
    viewRef.current = current;
    tapRef.current = tapAt;
  });

  // The handlers read the refs when a gesture happens, never during render.
  // eslint-disable-next-line react-hooks/refs
  const [responder] = useState(() => {
    const gesture: { current: { x: number; y: number; dist: number; moved: boolean; start: View2D | null } } = {
      current: { x: 0, y: 0, dist: 0, moved: false, start: null },
    };
    return PanResponder.create({
      onStartShouldSetPanResponder: () => true,
      onMoveShouldSetPanResponder: () => true,
      onPanResponderGrant: (e) => {
        gesture.current = {
          x: e.nativeEvent.locationX,
          y: e.nativeEvent.locationY,
          dist: touchDistance(e),
          moved: false,
          start: viewRef.current,
        };
      },
      onPanResponderMove: (e, g) => {
        const st = gesture.current;
        if (!st.start) return;
        if (Math.abs(g.dx) + Math.abs(g.dy) > 6) st.moved = true;
        const dist = touchDistance(e);
        if (dist && st.dist) {
          st.moved = true;
          const s = Math.min(MAX_SCALE, Math.max(MIN_SCALE, (st.start.s * dist) / st.dist));
          const px = st.x;
          const py = st.y;
          setView({
            s,
            tx: px - ((px - st.start.tx) * s) / st.start.s,
            ty: py - ((py - st.start.ty) * s) / st.start.s,
          });
        } else if (dist) {
          st.dist = dist;
        } else {
          setView({ ...st.start, tx: st.start.tx + g.dx, ty: st.start.ty + g.dy });
        }
      },
      onPanResponderRelease: () => {
        const st = gesture.current;
        if (!st.moved) tapRef.current(st.x, st.y);
      },
    });
  });

  // The mouse wheel zooms about the pointer (web).
  const canvas = useRef<View>(null);
  useEffect(() => {
    if (Platform.OS !== 'web') return;
    const node = canvas.current as unknown as HTMLElement | null;
    if (!node?.addEventListener) return;
    const onWheel = (ev: WheelEvent) => {
      ev.preventDefault();
      const r = node.getBoundingClientRect();
      zoomAt(ev.deltaY < 0 ? 1.15 : 1 / 1.15, ev.clientX - r.left, ev.clientY - r.top);
    };
    node.addEventListener('wheel', onWheel, { passive: false });
    return () => node.removeEventListener('wheel', onWheel);
  }, [d]);

  const find = () => {
    const view = current;
    if (!d || !view) return;
    const q = search.trim().toLowerCase();
    if (!q) return;
    const exact = (x: DrawnElement) =>
      x.id.toLowerCase() === q || !!x.summary?.hidden.some((id) => id.toLowerCase() === q);
    const partial = (x: DrawnElement) =>
      x.id.toLowerCase().includes(q) || !!x.summary?.hidden.some((id) => id.toLowerCase().includes(q));
    const e =
      d.elements.find((x) => x.kind !== 'summary' && exact(x)) ??
      d.elements.find(exact) ??
      d.elements.find((x) => x.kind !== 'summary' && partial(x)) ??
      d.elements.find(partial);
    if (!e) {
      setFound({ id: '', message: `No element "${search.trim()}" in this model` });
      return;
    }
    const s = Math.max(view.s, 0.8);
    setView({ s, tx: size.w / 2 - (e.box.x + e.box.w / 2) * s, ty: size.h / 2 - (e.box.y + e.box.h / 2) * s });
    setFound(
      e.kind === 'summary'
        ? {
            id: e.id,
            message: `${e.summary!.hidden.find((id) => id.toLowerCase() === q) ?? search.trim()} is inside the collapsed subtree under ${e.summary!.of}: expand it to see it.`,
          }
        : { id: e.id },
    );
  };

  if (drawing.error) return <Notice tone="error">{drawing.error.message}</Notice>;
  if (!d) return <T variant="small">Drawing the one-line diagram…</T>;

  const onLayout = (ev: LayoutChangeEvent) =>
    setSize({ w: ev.nativeEvent.layout.width, h: ev.nativeEvent.layout.height });
  // Only what is in view is drawn (large plants).
  const v = current ?? { s: 1, tx: 0, ty: 0 };
  const vx0 = -v.tx / v.s - 40;
  const vy0 = -v.ty / v.s - 80;
  const vx1 = (size.w - v.tx) / v.s + 40;
  const vy1 = (size.h - v.ty) / v.s + 80;
  const visible = (b: Box) => b.x + b.w + 300 >= vx0 && b.x - 20 <= vx1 && b.y + b.h >= vy0 && b.y <= vy1;
  const inView = (pts: number[]) => {
    let x0 = Infinity;
    let x1 = -Infinity;
    let y0 = Infinity;
    let y1 = -Infinity;
    for (let i = 0; i < pts.length; i += 2) {
      x0 = Math.min(x0, pts[i]);
      x1 = Math.max(x1, pts[i]);
      y0 = Math.min(y0, pts[i + 1]);
      y1 = Math.max(y1, pts[i + 1]);
    }
    return x1 >= vx0 && x0 <= vx1 && y1 >= vy0 && y0 <= vy1;
  };
  const target = found?.id ? d.elements.find((e) => e.id === found.id) : undefined;

  return (
    <View style={styles.panel}>
      <View style={styles.searchRow}>
        <Field
          label="Find an element by id"
          value={search}
          onChangeText={setSearch}
          onSubmitEditing={find}
          autoCapitalize="characters"
          containerStyle={styles.searchField}
          testID="one-line-search"
        />
        <Button title="Find" kind="secondary" onPress={find} testID="one-line-find" />
        <Button
          title="+"
          kind="secondary"
          accessibilityLabel="Zoom in"
          onPress={() => zoomAt(1.3, size.w / 2, size.h / 2)}
        />
        <Button
          title="−"
          kind="secondary"
          accessibilityLabel="Zoom out"
          onPress={() => zoomAt(1 / 1.3, size.w / 2, size.h / 2)}
        />
        <Button
          title="Fit"
          kind="secondary"
          accessibilityLabel="Fit the whole diagram"
          onPress={() => {
            const s = Math.max(MIN_SCALE, Math.min(1, (size.w - 16) / d.width, (size.h - 16) / d.height));
            setView({ s, tx: 8, ty: 8 });
          }}
        />
      </View>
      {d.scenarios.length ? (
        <Choice
          label="Dashed as in"
          value={scenario}
          options={[
            { value: 'base', label: 'As written' },
            ...d.scenarios.map((x) => ({ value: x.id, label: x.name })),
          ]}
          onChange={setScenario}
          testID="one-line-scenario"
        />
      ) : null}
      {found?.message ? <Notice tone="warning">{found.message}</Notice> : null}
      {target?.summary ? (
        <Button
          title={`Expand the ${target.summary.buses} buses under ${target.summary.of}`}
          kind="quiet"
          onPress={() => toggle(target.summary!.of)}
          testID="one-line-expand-found"
        />
      ) : target && (target.kind === 'bus' ? target.id : target.busId) ? (
        <Button
          title={`Open the clearing trace of ${target.kind === 'bus' ? target.id : target.busId}`}
          kind="quiet"
          onPress={() => open(target)}
          testID="one-line-open-found"
        />
      ) : null}
      <T variant="small">
        Tap a bus for its clearing trace, a device for its band; a branch opens the trace of the bus it feeds. Drag to
        move; pinch, the mouse wheel or the buttons to zoom.
      </T>
      <View ref={canvas} onLayout={onLayout} testID="one-line-canvas" style={styles.canvas} {...responder.panHandlers}>
        {size.w > 0 ? (
          <Svg width={size.w} height={size.h} accessibilityLabel={d.title}>
            <G transform={`translate(${v.tx}, ${v.ty}) scale(${v.s})`}>
              {d.connections.map((c, i) =>
                inView(c.pts) ? (
                  <ShapeView key={`c${i}`} s={{ t: 'line', pts: c.pts, tone: 'ink', width: 1.5, dashed: c.dashed }} />
                ) : null,
              )}
              {d.elements.map((e) =>
                visible(e.box) ? (
                  <G key={e.id}>
                    {e.shapes.map((s, i) => (
                      <ShapeView key={i} s={s} />
                    ))}
                  </G>
                ) : null,
              )}
              {d.elements.map((e) =>
                e.subtree && visible(e.box) ? (
                  <G key={`toggle-${e.id}`}>
                    <Rect
                      x={e.subtree.toggle.x}
                      y={e.subtree.toggle.y}
                      width={e.subtree.toggle.w}
                      height={e.subtree.toggle.h}
                      rx={3}
                      fill={colors.surface}
                      stroke={PALETTE.accent}
                      strokeWidth={1}
                    />
                    <SvgText
                      x={e.subtree.toggle.x + 6}
                      y={e.subtree.toggle.y + 11}
                      fontSize={10}
                      fill={PALETTE.accent}
                      fontWeight="600"
                      fontFamily="Inter, Arial, sans-serif"
                    >
                      {toggleText(e.subtree)}
                    </SvgText>
                  </G>
                ) : null,
              )}
              {target ? (
                <Rect
                  x={target.box.x - 6}
                  y={target.box.y - 6}
                  width={target.box.w + 12}
                  height={target.box.h + 12}
                  fill="none"
                  stroke={colors.focus}
                  strokeWidth={2 / v.s}
                />
              ) : null}
            </G>
          </Svg>
        ) : null}
        {size.w > 0
          ? d.elements.map((e) => {
              if (!visible(e.box)) return null;
              // A bus that feeds further: its toggle is a button (collapse / expand its subtree).
              if (e.subtree) {
                const tb = e.subtree.toggle;
                const w = Math.max(24, tb.w * v.s);
                const h = Math.max(24, tb.h * v.s);
                const left = v.tx + (tb.x + tb.w / 2) * v.s - w / 2;
                const top = v.ty + (tb.y + tb.h / 2) * v.s - h / 2;
                if (left + w < 0 || top + h < 0 || left > size.w || top > size.h) return null;
                const n = e.subtree.buses;
                return (
                  <Pressable
                    key={`press-${e.id}`}
                    accessibilityRole="button"
                    accessibilityLabel={`${e.subtree.collapsed ? 'Expand' : 'Collapse'} the ${n} bus${n === 1 ? '' : 'es'} under ${e.id}`}
                    onPress={() => toggle(e.id)}
                    testID={`one-line-toggle-${e.id}`}
                    style={[styles.hitArea, { left, top, width: w, height: h }]}
                  />
                );
              }
              // A collapsed subtree's box and each device in view are buttons (at least 24 px square).
              if (e.kind !== 'device' && e.kind !== 'summary') return null;
              const hb = e.kind === 'summary' ? e.box : hitBox(e);
              const w = Math.max(24, hb.w * v.s);
              const h = Math.max(24, hb.h * v.s);
              const left = v.tx + (hb.x + hb.w / 2) * v.s - w / 2;
              const top = v.ty + (hb.y + hb.h / 2) * v.s - h / 2;
              if (left + w < 0 || top + h < 0 || left > size.w || top > size.h) return null;
              return (
                <Pressable
                  key={`press-${e.id}`}
                  accessibilityRole="button"
                  accessibilityLabel={e.summary ? summaryA11yLabel(e) : deviceA11yLabel(e)}
                  onPress={() => open(e)}
                  style={[styles.hitArea, { left, top, width: w, height: h }]}
                />
              );
            })
          : null}
      </View>
      {d.notes.map((n) => (
        <T key={n} variant="small">
          {n}
        </T>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  /** A button over a drawn element (a device, a collapsed subtree, a collapse toggle); placed where it is drawn. */
  hitArea: { position: 'absolute', cursor: 'pointer' },
  panel: { gap: space.sm },
  canvas: {
    height: 560,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: 8,
    overflow: 'hidden',
    backgroundColor: colors.surface,
    // A web cursor beyond React Native's 'auto' | 'pointer' (react-native-web hands it to CSS).
    cursor: 'grab' as never,
  },
  searchRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'flex-end' },
  searchField: { flexGrow: 1, minWidth: 180 },
});
