/** The time-current plot's inputs, and the shapes its parts pass between them. */
import { type SeriesStyle } from './palette';
import { type CurrentUnit, type CurvePoint } from '../../shared/logPlot';

/** One protective device's band. Current in the plot's unit (amperes, or multiples of rating), time in seconds. */
export interface TimeCurrentSeries {
  id: string;
  /** Legend and readout name, e.g. "CB-2 feeder breaker". */
  label: string;
  /** Minimum curve, [current, seconds] by rising current; may be empty. */
  min: readonly (readonly [number, number])[];
  /** Maximum (total clearing) curve, [current, seconds] by rising current. */
  max: readonly (readonly [number, number])[];
}

/** A vertical line across the plot, e.g. at the full or reduced arcing current. */
export interface TimeCurrentVertical {
  /** Current in the plot's unit (amperes, or multiples of rating when currentUnit is '×In'). */
  currentA: number;
  /** Short name; the plot adds the current ("Full arcing" → "Full arcing 18.2 kA"). */
  label: string;
  /** 'full': solid, 'reduced': dashed, 'neutral' (default): dotted and muted. */
  tone?: 'full' | 'reduced' | 'neutral';
}

/** A point marked with a dot, e.g. where a device's maximum curve clears the arcing current. */
export interface TimeCurrentMark {
  /** Current in the plot's unit (amperes, or multiples of rating when currentUnit is '×In'). */
  currentA: number;
  timeS: number;
  /** Short name; the plot adds the time ("CB-2" → "CB-2 0.300 s"). */
  label: string;
  /** Colours the dot as that series; otherwise ink. */
  seriesId?: string;
}

export interface TimeCurrentPlotProps {
  series: readonly TimeCurrentSeries[];
  /** 'A': currents in amperes, axis "Current (A)"; '×In': multiples of the device rating. */
  currentUnit: CurrentUnit;
  verticals?: readonly TimeCurrentVertical[];
  marks?: readonly TimeCurrentMark[];
  /** Time axis, seconds (default [0.01, 1000]). */
  timeRangeS?: readonly [number, number];
  /** Current axis in the plot's unit (default: the data, the verticals and the marks, extended to whole decades). */
  currentRange?: readonly [number, number];
  /** Height of the drawing (axes included, legend and lists excluded), px. Default: from the width and the decades. */
  height?: number;
  testID?: string;
  /** Shown over an empty grid when no series has a drawable point (default "No trip band to show."). */
  emptyMessage?: string;
  /** The list of marks under the plot ("CB-2 at 18.2 kA: 0.300 s"); default true. */
  showMarkList?: boolean;
  /** Replaces the generated screen-reader summary. */
  accessibilityLabel?: string;
}

/** A reading position, kept as values so that it survives a change of width. */
export interface Probe {
  current: number;
  timeS: number;
}

export interface PreparedSeries {
  id: string;
  label: string;
  style: SeriesStyle;
  min: CurvePoint[];
  max: CurvePoint[];
}
