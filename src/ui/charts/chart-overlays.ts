import type uPlot from 'uplot';
import type { ResonanceNote } from './resonance-marks.ts';

/** Colours of what is drawn over and under the curves. */
export const OVERLAY_COLOURS = {
  /** Below 0 dB the filter makes the level at the LISN worse than no filter at all. */
  gainBand: 'rgba(200, 40, 40, 0.07)',
  zeroLine: '#7a2020',
  gainText: '#8a2a2a',
  selfResonance: '#3b4450',
} as const;

/**
 * Drawing beyond curves and grid: a tinted band where insertion loss is negative, a 0 dB line,
 * a dotted line with a ▼ at each element self-resonance, and a ring on each located peak or
 * notch of a drawn curve. Positions come from uPlot's scales; nothing here computes physics.
 */
export function overlayPlugin(notes: readonly ResonanceNote[]): uPlot.Plugin {
  return {
    hooks: {
      drawClear: [(u) => drawGainBand(u)],
      draw: [(u) => drawZeroLine(u), (u) => drawResonances(u, notes), (u) => drawGainLabel(u)],
    },
  };
}

function pixelRatio(u: uPlot): number {
  const cssWidth = u.over.getBoundingClientRect().width;
  return cssWidth > 0 ? u.bbox.width / cssWidth : 1;
}

function drawGainBand(u: uPlot): void {
  const { ctx, bbox } = u;
  const zero = u.valToPos(0, 'y', true);
  const bottom = bbox.top + bbox.height;
  if (zero >= bottom) return;
  const top = Math.max(zero, bbox.top);
  ctx.save();
  ctx.fillStyle = OVERLAY_COLOURS.gainBand;
  ctx.fillRect(bbox.left, top, bbox.width, bottom - top);
  ctx.restore();
}

/** Over the grid, which would otherwise paint its own light line across it. */
function drawZeroLine(u: uPlot): void {
  const { ctx, bbox } = u;
  const zero = u.valToPos(0, 'y', true);
  if (!(zero > bbox.top && zero < bbox.top + bbox.height)) return;
  ctx.save();
  ctx.setLineDash([]);
  ctx.strokeStyle = OVERLAY_COLOURS.zeroLine;
  ctx.lineWidth = 1.25 * pixelRatio(u);
  ctx.beginPath();
  ctx.moveTo(bbox.left, zero);
  ctx.lineTo(bbox.left + bbox.width, zero);
  ctx.stroke();
  ctx.restore();
}

/** Says what the band means; drawn last, over a see-through backing so crossing lines stay visible. */
function drawGainLabel(u: uPlot): void {
  const { ctx, bbox } = u;
  const ratio = pixelRatio(u);
  const zero = u.valToPos(0, 'y', true);
  const bottom = bbox.top + bbox.height;
  if (!(zero > bbox.top && bottom - zero > 16 * ratio)) return;
  const text = 'below 0 dB: more noise than with no filter';
  const right = bbox.left + bbox.width - 6 * ratio;
  ctx.save();
  ctx.font = `${11 * ratio}px system-ui, sans-serif`;
  const width = ctx.measureText(text).width;
  ctx.fillStyle = 'rgba(255, 255, 255, 0.7)';
  ctx.fillRect(right - width - 3 * ratio, zero + 2 * ratio, width + 6 * ratio, 14 * ratio);
  ctx.fillStyle = OVERLAY_COLOURS.gainText;
  ctx.textAlign = 'right';
  ctx.textBaseline = 'top';
  ctx.fillText(text, right, zero + 3 * ratio);
  ctx.restore();
}

function drawResonances(u: uPlot, notes: readonly ResonanceNote[]): void {
  const { ctx, bbox } = u;
  const ratio = pixelRatio(u);
  const left = bbox.left;
  const right = bbox.left + bbox.width;
  ctx.save();
  ctx.beginPath();
  ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
  ctx.clip();
  for (const note of notes) {
    const x = u.valToPos(note.frequencyHz, 'x', true);
    if (!(x >= left && x <= right)) continue;
    if (note.kind === 'self-resonance') {
      ctx.strokeStyle = OVERLAY_COLOURS.selfResonance;
      ctx.globalAlpha = 0.45;
      ctx.lineWidth = ratio;
      ctx.setLineDash([2 * ratio, 3 * ratio]);
      ctx.beginPath();
      ctx.moveTo(x, bbox.top);
      ctx.lineTo(x, bbox.top + bbox.height);
      ctx.stroke();
      ctx.setLineDash([]);
      ctx.globalAlpha = 1;
      const size = 5 * ratio;
      ctx.fillStyle = OVERLAY_COLOURS.selfResonance;
      ctx.beginPath();
      ctx.moveTo(x - size, bbox.top);
      ctx.lineTo(x + size, bbox.top);
      ctx.lineTo(x, bbox.top + 1.6 * size);
      ctx.closePath();
      ctx.fill();
    } else {
      const y = u.valToPos(note.valueDb, 'y', true);
      ctx.setLineDash([]);
      ctx.strokeStyle = note.series.stroke;
      ctx.fillStyle = '#ffffff';
      ctx.lineWidth = 1.5 * ratio;
      ctx.beginPath();
      ctx.arc(x, y, 4 * ratio, 0, 2 * Math.PI);
      ctx.fill();
      ctx.stroke();
    }
  }
  ctx.restore();
}
