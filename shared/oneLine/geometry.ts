/**
 * The one-line diagram as pure geometry: boxes, lines, circles and texts with coordinates (px, y down). The SVG
 * writer (`svg.ts`), the app's view and the study report draw exactly this; nothing here knows how it is rendered.
 * Colours are named tones, mapped to the product's palette by each renderer.
 */

export type Tone = 'ink' | 'muted' | 'accent' | 'danger' | 'caution' | 'problem' | 'surface';

export type Shape =
  | { t: 'line'; pts: number[]; tone: Tone; width: number; dashed?: boolean }
  | {
      t: 'rect';
      x: number;
      y: number;
      w: number;
      h: number;
      tone: Tone;
      fill?: Tone;
      dashed?: boolean;
      /** The background of the text drawn next (drawn without an outline). */
      halo?: boolean;
    }
  | { t: 'circle'; cx: number; cy: number; r: number; tone: Tone; fill?: Tone; dashed?: boolean }
  | {
      t: 'text';
      x: number;
      y: number;
      text: string;
      size: number;
      anchor: 'start' | 'middle' | 'end';
      tone: Tone;
      bold?: boolean;
    };

export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

export type ElementKind =
  'bus' | 'utility' | 'generator' | 'motor' | 'transformer' | 'cable' | 'tie' | 'device' | 'summary';

export interface DrawnElement {
  id: string;
  kind: ElementKind;
  /** The element's symbol (for a bus, its bar): what must not overlap and what lines end on. */
  box: Box;
  /** The bus a tap opens: the bus itself, or for a device the bus it protects. */
  busId?: string;
  /** For a device: its kind (relay, fuse, …), for the words that name it. */
  deviceKind?: 'relay' | 'fuse' | 'thermal-magnetic' | 'electronic' | 'band';
  /** Out of service in the scenario drawn, or an open tie. */
  dashed?: boolean;
  /** Named in a model problem (for a summary: something inside it is). */
  problem?: boolean;
  /** A bus that feeds further: how many buses its subtree holds, whether it is collapsed, and where the app puts its toggle (a place kept free beside the bus id). */
  subtree?: { buses: number; collapsed: boolean; toggle: Box };
  /**
   * A collapsed subtree drawn as one box: the bus it hangs from, how many buses it holds, the ids of every element
   * it stands for (buses first), and the highest incident energy among its buses.
   */
  summary?: {
    of: string;
    buses: number;
    hidden: string[];
    worst?: { busId: string; incidentEnergyCalPerCm2: number; signalWord: 'DANGER' | 'WARNING' | null };
  };
  shapes: Shape[];
}

/** A line joining two elements: its first point lies on the box of `a`, its last on the box of `b`. */
export interface Connection {
  a: string;
  b: string;
  pts: number[];
  dashed?: boolean;
}

export interface OneLineDrawing {
  width: number;
  height: number;
  elements: DrawnElement[];
  connections: Connection[];
  /** The buses drawn collapsed (each with one summary element). */
  collapsed: string[];
  /** Shown under the drawing (e.g. which scenario the dashes stand for). */
  notes: string[];
}

/** Hazard shown at a bus (from a study run's results). */
export interface BusHazard {
  incidentEnergyCalPerCm2: number;
  signalWord: 'DANGER' | 'WARNING' | null;
  /** The governing scenario's name, where the study has several. */
  scenario?: string | null;
}

/** Text width estimate (px) for the fonts used (average glyph about 0.6 em; conservative for ids). */
export function textWidth(text: string, size: number): number {
  return Math.ceil(text.length * size * 0.62);
}

/** The box a text shape covers (from its estimated width; the glyphs' height above and below the baseline). */
export function textBox(s: Extract<Shape, { t: 'text' }>): Box {
  const w = textWidth(s.text, s.size);
  const x = s.anchor === 'start' ? s.x : s.anchor === 'middle' ? s.x - w / 2 : s.x - w;
  return { x, y: s.y - s.size * 0.8, w, h: s.size * 1.05 };
}

export function boxesOverlap(a: Box, b: Box): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

/** Whether point (x, y) lies on or within `tol` px of the box's outline or inside it. */
export function touchesBox(x: number, y: number, b: Box, tol = 0.5): boolean {
  return x >= b.x - tol && x <= b.x + b.w + tol && y >= b.y - tol && y <= b.y + b.h + tol;
}

/** The app's collapse toggle beside a bus id: "− 12 buses" (open) or "+ 12 buses" (collapsed). */
export const toggleText = (t: { buses: number; collapsed: boolean }) =>
  `${t.collapsed ? '+' : '−'} ${t.buses} bus${t.buses === 1 ? '' : 'es'}`;
