/**
 * The memo's figures as plain shapes (rectangles, lines, circles, text) in points. One layout,
 * three painters: the PDF draws the shapes as vectors, the DOCX embeds them as SVG with a PNG
 * fallback, and the HTML preview shows the SVG. So the figures read the same in every format and
 * use the same colour scale as the overlap map on screen.
 */
import { colourOf } from '../overlap-colours';
import type { EigenvalueFigure, MemoFigure, OverlapMapFigure, StandardErrorFigure } from './memo-document';

/** A shape of a figure; coordinates in points from the top-left corner. */
export type FigureShape =
  | { readonly kind: 'rect'; readonly x: number; readonly y: number; readonly w: number; readonly h: number; readonly fill: string }
  | { readonly kind: 'line'; readonly points: readonly (readonly [number, number])[]; readonly stroke: string; readonly width: number; readonly dash?: readonly [number, number] }
  | { readonly kind: 'circle'; readonly cx: number; readonly cy: number; readonly r: number; readonly fill: string }
  | {
      readonly kind: 'text';
      readonly x: number;
      readonly y: number;
      readonly text: string;
      readonly size: number;
      readonly anchor: 'start' | 'middle' | 'end';
      /** Degrees, counter-clockwise rotation about (x, y); only -90 is used. */
      readonly rotate?: -90;
      readonly fill: string;
    };

/** A figure laid out: its size in points and its shapes in painting order. */
export interface FigureDrawing {
  readonly width: number;
  readonly height: number;
  readonly shapes: readonly FigureShape[];
}

const INK = '#1f2430';
const GRID = '#9aa0ab';
/** Above this many items the map carries no item labels (they would be under 4 points). */
const MAX_LABELLED_ITEMS = 80;

/**
 * A colour as #rrggbb from the `rgb(r, g, b)` text d3 returns.
 * @param css the colour.
 * @returns the hex form.
 */
export function hexColour(css: string): string {
  const match = /rgb\((\d+),\s*(\d+),\s*(\d+)\)/.exec(css);
  if (!match) return css.startsWith('#') ? css : '#000000';
  return `#${[match[1], match[2], match[3]].map((part) => Number(part).toString(16).padStart(2, '0')).join('')}`;
}

function overlapMapDrawing(figure: OverlapMapFigure, width: number): FigureDrawing {
  const count = figure.items.length;
  const labelled = count <= MAX_LABELLED_ITEMS;
  const longest = labelled ? Math.max(4, ...figure.items.map((id) => id.length)) : 0;
  const cellGuess = (width - 40) / Math.max(count, 1);
  const fontSize = labelled ? Math.max(3.5, Math.min(7, cellGuess * 0.8)) : 0;
  const margin = labelled ? Math.ceil(longest * fontSize * 0.55) + 4 : 4;
  const cell = (width - margin - 4) / Math.max(count, 1);
  const side = cell * count;
  const legendTop = margin + side + 14;
  const shapes: FigureShape[] = [];
  for (let row = 0; row < count; row += 1) {
    for (let column = 0; column < count; column += 1) {
      const value = figure.matrix[row][column];
      shapes.push({
        kind: 'rect',
        x: margin + column * cell,
        y: margin + row * cell,
        w: cell + 0.05,
        h: cell + 0.05,
        fill: value === null ? '#c8c8c8' : hexColour(colourOf(value)),
      });
    }
  }
  for (const position of figure.scaleBreaks) {
    const offset = margin + position * cell;
    shapes.push({ kind: 'line', points: [[margin, offset], [margin + side, offset]], stroke: INK, width: 0.8 });
    shapes.push({ kind: 'line', points: [[offset, margin], [offset, margin + side]], stroke: INK, width: 0.8 });
  }
  if (labelled) {
    figure.items.forEach((id, position) => {
      const centre = margin + (position + 0.5) * cell + fontSize * 0.35;
      shapes.push({ kind: 'text', x: margin - 2, y: centre, text: id, size: fontSize, anchor: 'end', fill: INK });
      shapes.push({ kind: 'text', x: centre, y: margin - 2, text: id, size: fontSize, anchor: 'start', rotate: -90, fill: INK });
    });
  }
  // Legend: the colour scale from -1 to 1 with five ticks.
  const legendWidth = Math.min(220, side);
  const legendLeft = margin + (side - legendWidth) / 2;
  const steps = 40;
  for (let step = 0; step < steps; step += 1) {
    const r = -1 + (2 * (step + 0.5)) / steps;
    shapes.push({ kind: 'rect', x: legendLeft + (step * legendWidth) / steps, y: legendTop, w: legendWidth / steps + 0.05, h: 8, fill: hexColour(colourOf(r)) });
  }
  for (const tick of [-1, -0.5, 0, 0.5, 1]) {
    const x = legendLeft + ((tick + 1) / 2) * legendWidth;
    shapes.push({ kind: 'line', points: [[x, legendTop + 8], [x, legendTop + 11]], stroke: INK, width: 0.5 });
    shapes.push({ kind: 'text', x, y: legendTop + 19, text: tick === 0 ? '0' : tick.toFixed(1).replace(/^(-?)0\./, '$1.'), size: 6.5, anchor: 'middle', fill: INK });
  }
  shapes.push({ kind: 'text', x: legendLeft + legendWidth / 2, y: legendTop + 28, text: 'correlation r', size: 6.5, anchor: 'middle', fill: INK });
  return { width, height: legendTop + 32, shapes };
}

function niceStep(range: number): number {
  const rough = range / 5;
  const power = 10 ** Math.floor(Math.log10(rough));
  const scaled = rough / power;
  return (scaled <= 1 ? 1 : scaled <= 2 ? 2 : scaled <= 5 ? 5 : 10) * power;
}

function eigenvalueDrawing(figure: EigenvalueFigure, width: number): FigureDrawing {
  const height = Math.round(width * 0.5);
  const left = 34;
  const right = 10;
  const top = 10;
  const bottom = 30;
  const plotWidth = width - left - right;
  const plotHeight = height - top - bottom;
  const count = figure.observed.length;
  const maximum = Math.max(1, ...figure.observed, ...(figure.random95 ?? []));
  const step = niceStep(maximum);
  const yMax = Math.ceil(maximum / step) * step;
  const x = (component: number) => left + (count <= 1 ? plotWidth / 2 : ((component - 1) / (count - 1)) * plotWidth);
  const y = (value: number) => top + plotHeight - (Math.max(0, value) / yMax) * plotHeight;
  const shapes: FigureShape[] = [];
  for (let tick = 0; tick <= yMax + 1e-9; tick += step) {
    shapes.push({ kind: 'line', points: [[left, y(tick)], [left + plotWidth, y(tick)]], stroke: '#e3e5ea', width: 0.5 });
    shapes.push({ kind: 'text', x: left - 4, y: y(tick) + 2.5, text: String(Math.round(tick * 100) / 100), size: 7, anchor: 'end', fill: INK });
  }
  shapes.push({ kind: 'line', points: [[left, top], [left, top + plotHeight], [left + plotWidth, top + plotHeight]], stroke: GRID, width: 0.8 });
  const xStep = Math.max(1, Math.ceil(count / 12));
  for (let component = 1; component <= count; component += xStep) {
    shapes.push({ kind: 'text', x: x(component), y: top + plotHeight + 11, text: String(component), size: 7, anchor: 'middle', fill: INK });
  }
  shapes.push({ kind: 'text', x: left + plotWidth / 2, y: height - 4, text: 'component', size: 7.5, anchor: 'middle', fill: INK });
  if (figure.random95) {
    shapes.push({ kind: 'line', points: figure.random95.map((value, index) => [x(index + 1), y(value)] as const), stroke: '#7a3208', width: 1.2, dash: [3, 2] });
  }
  shapes.push({ kind: 'line', points: figure.observed.map((value, index) => [x(index + 1), y(value)] as const), stroke: '#2e3a80', width: 1 });
  figure.observed.forEach((value, index) => shapes.push({ kind: 'circle', cx: x(index + 1), cy: y(value), r: 1.8, fill: '#2e3a80' }));
  // Key, top right.
  const keyX = left + plotWidth - 120;
  shapes.push({ kind: 'circle', cx: keyX, cy: top + 8, r: 1.8, fill: '#2e3a80' });
  shapes.push({ kind: 'text', x: keyX + 6, y: top + 10.5, text: 'observed eigenvalue', size: 7, anchor: 'start', fill: INK });
  if (figure.random95) {
    shapes.push({ kind: 'line', points: [[keyX - 4, top + 19], [keyX + 4, top + 19]], stroke: '#7a3208', width: 1.2, dash: [3, 2] });
    shapes.push({ kind: 'text', x: keyX + 6, y: top + 21.5, text: 'random data, 95th percentile', size: 7, anchor: 'start', fill: INK });
  }
  return { width, height, shapes };
}

function standardErrorDrawing(figure: StandardErrorFigure, width: number): FigureDrawing {
  const rowHeight = figure.hasCut ? 16 : 10;
  const labelWidth = 64;
  const plot = width - labelWidth - 8;
  const largest = Math.max(1e-12, ...figure.rows.flatMap((row) => [row.before, row.after].map((split) => (split ? split.own + split.overlap : 0))));
  const shapes: FigureShape[] = [];
  const bar = (y: number, split: { own: number; overlap: number }, pale: boolean) => {
    const own = (split.own / largest) * plot;
    shapes.push({ kind: 'rect', x: labelWidth, y, w: own, h: 6, fill: pale ? '#9aa7c9' : '#2e3a80' });
    shapes.push({ kind: 'rect', x: labelWidth + own, y, w: (split.overlap / largest) * plot, h: 6, fill: pale ? '#e5bf86' : '#b4621c' });
  };
  figure.rows.forEach((row, index) => {
    const y = 4 + index * rowHeight;
    shapes.push({ kind: 'text', x: labelWidth - 4, y: y + 6, text: row.term, size: 6.5, anchor: 'end', fill: INK });
    if (row.before) bar(y, row.before, false);
    if (figure.hasCut) {
      if (row.after) bar(y + 7, row.after, true);
      else shapes.push({ kind: 'text', x: labelWidth + 2, y: y + 13, text: 'cut', size: 6, anchor: 'start', fill: GRID });
    }
  });
  const keyY = 4 + figure.rows.length * rowHeight + 10;
  shapes.push({ kind: 'rect', x: labelWidth, y: keyY - 5, w: 8, h: 6, fill: '#2e3a80' });
  shapes.push({ kind: 'text', x: labelWidth + 11, y: keyY, text: 'without overlap', size: 6.5, anchor: 'start', fill: INK });
  shapes.push({ kind: 'rect', x: labelWidth + 80, y: keyY - 5, w: 8, h: 6, fill: '#b4621c' });
  shapes.push({ kind: 'text', x: labelWidth + 91, y: keyY, text: figure.hasCut ? 'added by overlap; paler: after the cut' : 'added by overlap', size: 6.5, anchor: 'start', fill: INK });
  return { width, height: keyY + 6, shapes };
}

/**
 * Lays a memo figure out as shapes.
 * @param figure the figure.
 * @param width the width available, in points (at least 120).
 * @throws Error when the width is below 120 points.
 * @returns the drawing.
 */
export function layoutFigure(figure: MemoFigure, width: number): FigureDrawing {
  if (!(width >= 120)) throw new Error(`layoutFigure: width must be at least 120 points, got ${width}`);
  if (figure.kind === 'overlap-map') return overlapMapDrawing(figure, width);
  if (figure.kind === 'standard-errors') return standardErrorDrawing(figure, width);
  return eigenvalueDrawing(figure, width);
}
