/**
 * A plot as plain data: what the page's interactive chart (uPlot) and the SVG renderer (export and
 * the printable report) both draw, so the two can never disagree. Builders in src/drawing/plots/
 * make a PlotSpec from results; renderers only place and style it. Frequencies in Hz, values in the
 * y axis' unit; NaN in a value column is a gap (nothing drawn there). Colours are palette names
 * (plot-palette.ts), resolved per theme by each renderer, so a dark page and a printed report each
 * get colours that read on their background.
 */

export type PlotColor =
  | 'common-mode'
  | 'differential-mode'
  | 'conversion'
  | 'limit-1'
  | 'limit-2'
  | 'limit-3'
  | 'limit-4'
  | 'peak'
  | 'quasi-peak'
  | 'average'
  | 'scan-peak'
  | 'scan-quasi-peak'
  | 'scan-average'
  | 'unfiltered'
  | 'required'
  | 'floor'
  | 'worst'
  | 'shortfall'
  | 'neutral'
  | 'accent'
  | 'series-1'
  | 'series-2'
  | 'series-3'
  | 'series-4'
  | 'series-5'
  | 'series-6';

/**
 * Line dashes. Variants overlaid on one plot differ by dash (and a marker glyph in the legend), never by
 * colour alone: colour already says which quantity a curve is, and a printed report may be grey.
 */
export type PlotDash = 'solid' | 'dash' | 'dot' | 'dash-dot' | 'long-dash';

export interface SeriesStyle {
  readonly color: PlotColor;
  readonly dash: PlotDash;
  /** Line width in CSS pixels at 1× (both renderers scale it the same way). */
  readonly width: number;
  /** `line` joins the points; `dots` draws one dot per value and nothing between (a line spectrum). */
  readonly draw: 'line' | 'dots';
}

export interface PlotSeries {
  readonly id: string;
  /** Shown in the legend and the cursor readout; user text (a variant or mask name) is plain text. */
  readonly label: string;
  readonly frequencyHz: Float64Array;
  readonly values: Float64Array;
  readonly style: SeriesStyle;
  /** The variant a curve belongs to when several are overlaid; absent for the one shown. */
  readonly variantId?: string;
  /** How a renderer thins many points into few pixels: keep the highest (levels) or the lowest (limits, margins). */
  readonly reduce: 'max' | 'min';
  /** Hidden by the legend toggle: kept in the spec (the readout still lists it), not drawn. */
  readonly hidden?: boolean;
}

/** A filled area between two curves on one grid (the spread of the worst-case terminations). */
export interface PlotBand {
  readonly id: string;
  readonly label: string;
  readonly frequencyHz: Float64Array;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly color: PlotColor;
  readonly hidden?: boolean;
}

/** A point to mark: a self-resonance, a located peak or notch, the worst margin. */
export interface PlotMarker {
  readonly frequencyHz: number;
  /** Where on the y axis; undefined draws the mark at the top edge (a frequency-only mark such as an SRF). */
  readonly value: number | undefined;
  readonly label: string;
  readonly shape: 'triangle-down' | 'circle' | 'diamond' | 'cross';
  readonly color: PlotColor;
}

/** A shaded frequency span across the whole height (where the margin falls short of the target). */
export interface PlotRegion {
  readonly startHz: number;
  readonly stopHz: number;
  readonly label: string;
  readonly color: PlotColor;
}

/** A horizontal reference line (the receiver's noise floor, a stability bound). */
export interface PlotLevel {
  readonly value: number;
  readonly label: string;
  readonly color: PlotColor;
  readonly dash: PlotDash;
}

export interface PlotAxis {
  readonly label: string;
  /** Shown after values in the readout: 'dB', 'dBµV', 'Ω'. */
  readonly unit: string;
  /** Fixed range; absent means fitted to what is drawn. */
  readonly min?: number;
  readonly max?: number;
  readonly scale: 'linear' | 'log';
}

export interface PlotSpec {
  /** Stable id: 'emissions', 'insertion-loss', 'required-attenuation', 'part-impedance', … */
  readonly id: string;
  readonly title: string;
  /** One sentence a screen reader and the report caption use. */
  readonly description: string;
  /** Always logarithmic frequency; min and max in Hz. */
  readonly x: { readonly label: string; readonly min: number; readonly max: number };
  readonly y: PlotAxis;
  /** Drawing order: bands and regions first, then series in order (last on top), then markers. */
  readonly series: readonly PlotSeries[];
  readonly bands: readonly PlotBand[];
  readonly regions: readonly PlotRegion[];
  readonly levels: readonly PlotLevel[];
  readonly markers: readonly PlotMarker[];
  /** Short notes drawn under the plot (an attribution, a conservative comparison). */
  readonly notes: readonly string[];
}
