import type { PlotColor, PlotDash } from './plot-spec.ts';

/**
 * Plot colours per theme. Light is also the print palette (the report). The mode colours hold across
 * every plot: common mode blue, differential mode amber; detectors and limits have their own hues.
 * Dark values are lighter and less saturated so thin lines read on a dark panel.
 */
export type PlotTheme = 'light' | 'dark';

export const PLOT_PALETTE: Readonly<Record<PlotTheme, Readonly<Record<PlotColor, string>>>> = {
  light: {
    'common-mode': '#1f5fa8',
    'differential-mode': '#b45f06',
    conversion: '#7a3e9d',
    'limit-1': '#9b1c1c',
    'limit-2': '#3d4652',
    'limit-3': '#8a5a00',
    'limit-4': '#1d4f91',
    peak: '#4b5563',
    'quasi-peak': '#0d7a6f',
    average: '#6a3d9a',
    'scan-peak': '#c3c9d1',
    'scan-quasi-peak': '#a6d3cc',
    'scan-average': '#d3c3e4',
    unfiltered: '#8c96a3',
    required: '#b42318',
    floor: '#6b7480',
    worst: '#9b1c1c',
    shortfall: 'rgba(200, 40, 40, 0.13)',
    neutral: '#56606c',
    accent: '#1f5fa8',
    'series-1': '#1f5fa8',
    'series-2': '#b45f06',
    'series-3': '#0d7a6f',
    'series-4': '#7a3e9d',
    'series-5': '#9b1c1c',
    'series-6': '#4b5563',
  },
  dark: {
    'common-mode': '#79aef2',
    'differential-mode': '#f0a95a',
    conversion: '#c79be6',
    'limit-1': '#ff8a80',
    'limit-2': '#c9d1db',
    'limit-3': '#e8c36a',
    'limit-4': '#8fb8f5',
    peak: '#b8c0cc',
    'quasi-peak': '#5fd0c0',
    average: '#b99be0',
    'scan-peak': '#4a525d',
    'scan-quasi-peak': '#2f5a54',
    'scan-average': '#4d4260',
    unfiltered: '#7d8794',
    required: '#ff7b6b',
    floor: '#9aa4b1',
    worst: '#ff8a80',
    shortfall: 'rgba(255, 110, 100, 0.16)',
    neutral: '#aab4c0',
    accent: '#79aef2',
    'series-1': '#79aef2',
    'series-2': '#f0a95a',
    'series-3': '#5fd0c0',
    'series-4': '#c79be6',
    'series-5': '#ff8a80',
    'series-6': '#b8c0cc',
  },
};

/** Dash patterns in CSS pixels (on, off, …); the same numbers serve canvas setLineDash and SVG stroke-dasharray. */
export const DASH_PATTERN: Readonly<Record<PlotDash, readonly number[]>> = {
  solid: [],
  dash: [8, 4],
  dot: [2, 3],
  'dash-dot': [8, 3, 2, 3],
  'long-dash': [14, 5],
};

/** Up to four overlaid variants: the dash each one's curves take, in order (the shown design is solid). */
export const VARIANT_DASHES: readonly PlotDash[] = ['long-dash', 'dot', 'dash-dot', 'dash'];
