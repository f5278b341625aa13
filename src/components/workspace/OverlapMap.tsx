/**
 * The overlap map: the item correlation matrix of a done audit drawn on a canvas, ordered by the
 * cluster tree, by scale or in questionnaire order. Hover (or move the focus with the arrow keys)
 * to read a pair, click (or press Enter) to open it: both items' wording, r with its interval and
 * n, the evidence, the recommendation that involves them and their crosstab.
 *
 * Loads only its slice (GET /api/audits/{id}/overlap-map) and a pair's crosstab when opened.
 * Drawing: the matrix is written once per ordering and threshold as one pixel per cell and
 * scaled up without smoothing (a 300-item map is 90 000 pixels, not 90 000 rectangles); hover and
 * focus draw on a second canvas on top, so a pointer sweep repaints a few rectangles per frame.
 */
import { memo, useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { callApi } from '../../lib/api/client';
import { mapCorrelation, type MapOrdering, type OverlapMap as OverlapMapData, type OverlapMapPair } from '../../lib/api/overlap-map';
import { colourOf, writeColour } from '../../lib/overlap-colours';
import PairDetail from './PairDetail';
import { HoverCard, formatR as format } from './PairFigures';

const orderingLabels: Record<MapOrdering, string> = {
  cluster: 'By overlap (cluster tree)',
  scale: 'By scale',
  questionnaire: 'Questionnaire order',
};

/** Largest drawing size of the matrix, CSS pixels. */
const MAX_SIZE = 680;
/** Smallest cell that still gets item ids written beside it. */
const LABEL_MIN_CELL = 10;
const LABEL_MARGIN = 84;
/** Smallest cell that gets a dot when its pair is at or above the threshold. */
const DOT_MIN_CELL = 6;


interface Cell {
  row: number; // position in the current order
  column: number;
}

export default function OverlapMap({ auditId }: { auditId: string }) {
  const [data, setData] = useState<OverlapMapData | null>(null);
  const [problem, setProblem] = useState('');
  const [ordering, setOrdering] = useState<MapOrdering>('cluster');
  const [threshold, setThreshold] = useState<number>(0.8);
  const [highlight, setHighlight] = useState(false);
  const [outlines, setOutlines] = useState(true);
  const [hover, setHover] = useState<Cell | null>(null);
  const [focus, setFocus] = useState<Cell>({ row: 0, column: 1 });
  const [keyboard, setKeyboard] = useState(false);
  const [opened, setOpened] = useState<{ a: number; b: number } | null>(null);
  const [announcement, setAnnouncement] = useState('');
  const [width, setWidth] = useState(MAX_SIZE);
  const wrapper = useRef<HTMLDivElement>(null);
  const base = useRef<HTMLCanvasElement>(null);
  const overlay = useRef<HTMLCanvasElement>(null);
  const pending = useRef<{ x: number; y: number } | null>(null);
  const frame = useRef(0);
  const hoverNow = useRef<Cell | null>(null);

  useEffect(() => {
    let stopped = false;
    void callApi<OverlapMapData>('GET', `/api/audits/${auditId}/overlap-map`).then((result) => {
      if (stopped) return;
      if (!result.ok) setProblem(result.error.message);
      else {
        setData(result.data);
        if (result.data.strongPairThreshold !== null) setThreshold(result.data.strongPairThreshold);
      }
    });
    return () => {
      stopped = true;
    };
  }, [auditId]);

  useEffect(() => {
    const element = wrapper.current;
    if (!element) return;
    const observer = new ResizeObserver((entries) => setWidth(Math.floor(entries[0].contentRect.width)));
    observer.observe(element);
    return () => observer.disconnect();
  }, [data !== null]);

  const m = data?.items.length ?? 0;
  const order = data ? data.orders[ordering] : [];
  const showLabels = m > 0 && (Math.min(MAX_SIZE, width) - LABEL_MARGIN) / m >= LABEL_MIN_CELL;
  const margin = showLabels ? LABEL_MARGIN : 8;
  const size = Math.max(120, Math.min(MAX_SIZE, width) - margin);
  const cell = m > 0 ? size / m : 0;

  /** The full matrix as one typed array (NaN where a pair has none), unpacked once per slice. */
  const dense = useMemo(() => {
    if (!data) return new Float32Array(0);
    const values = new Float32Array(m * m).fill(Number.NaN);
    let k = 0;
    for (let i = 0; i < m; i++) {
      values[i * m + i] = 1;
      for (let j = i + 1; j < m; j++, k++) {
        const r = data.upper[k];
        if (r !== null) {
          values[i * m + j] = r;
          values[j * m + i] = r;
        }
      }
    }
    return values;
  }, [data]);
  const aboveThreshold = useMemo(() => (data ? data.upper.reduce<number>((count, r) => count + (r !== null && Math.abs(r) >= threshold ? 1 : 0), 0) : 0), [data, threshold]);

  /** Pair evidence by item-index key. */
  const evidence = useMemo(() => {
    const byKey = new Map<string, OverlapMapPair>();
    for (const pair of data?.pairs ?? []) byKey.set(`${pair.a}:${pair.b}`, pair);
    return byKey;
  }, [data]);
  const clusterOf = useMemo(() => {
    const byItem = new Map<number, number>();
    data?.clusters.forEach((cluster, k) => cluster.items.forEach((i) => byItem.set(i, k)));
    return byItem;
  }, [data]);

  // The matrix layer: redrawn when the ordering, size, threshold or outline choice changes.
  useEffect(() => {
    const canvas = base.current;
    if (!data || !canvas || m === 0) return;
    const started = performance.now();
    const context = clearedContext(canvas, size + margin);
    if (!context) return;
    // One pixel per cell, then scaled up without smoothing.
    const image = new ImageData(m, m);
    const rgba = image.data;
    for (let row = 0; row < m; row++) {
      const base = order[row] * m;
      for (let column = 0; column < m; column++) {
        const offset = (row * m + column) * 4;
        if (row === column) {
          rgba[offset] = 150;
          rgba[offset + 1] = 152;
          rgba[offset + 2] = 156;
          rgba[offset + 3] = 255;
          continue;
        }
        const value = dense[base + order[column]];
        const r = Number.isNaN(value) ? null : value;
        writeColour(r, rgba, offset, highlight && (r === null || Math.abs(r) < threshold));
      }
    }
    const scratch = document.createElement('canvas');
    scratch.width = m;
    scratch.height = m;
    scratch.getContext('2d')?.putImageData(image, 0, 0);
    context.imageSmoothingEnabled = false;
    context.drawImage(scratch, margin, margin, size, size);

    // Pairs at or above the threshold: a dot in the cell where cells are large enough to hold one
    // (at 300 items a cell is about two pixels: there the fading does the highlighting).
    if (cell >= DOT_MIN_CELL) {
      context.fillStyle = '#1c2127';
      const radius = Math.max(1.5, cell * 0.14);
      for (let row = 0; row < m; row++) {
        for (let column = 0; column < m; column++) {
          if (row === column) continue;
          const r = dense[order[row] * m + order[column]];
          if (Number.isNaN(r) || Math.abs(r) < threshold) continue;
          context.beginPath();
          context.arc(margin + (column + 0.5) * cell, margin + (row + 0.5) * cell, radius, 0, 2 * Math.PI);
          context.fill();
        }
      }
    }

    // Scale boundaries: a line wherever the scale changes along the current order.
    context.strokeStyle = 'rgba(28, 33, 39, 0.55)';
    context.lineWidth = 1;
    context.beginPath();
    for (let k = 1; k < m; k++) {
      if (data.items[order[k]].scale !== data.items[order[k - 1]].scale) {
        const at = margin + k * cell;
        if (ordering === 'cluster') {
          // In tree order scales interleave: tick the edges only, the map itself stays readable.
          context.moveTo(at, margin - 6);
          context.lineTo(at, margin);
          context.moveTo(margin - 6, at);
          context.lineTo(margin, at);
        } else {
          context.moveTo(at, margin);
          context.lineTo(at, margin + size);
          context.moveTo(margin, at);
          context.lineTo(margin + size, at);
        }
      }
    }
    context.stroke();

    // Overlap clusters: a block outline where the members sit together, else each member pair.
    if (outlines) {
      const positionOf = new Int32Array(m);
      order.forEach((i, k) => (positionOf[i] = k));
      context.strokeStyle = '#1c2127';
      context.lineWidth = 2;
      for (const cluster of data.clusters) {
        const places = cluster.items.map((i) => positionOf[i]).sort((a, b) => a - b);
        const contiguous = places[places.length - 1] - places[0] === places.length - 1;
        if (contiguous) {
          context.strokeRect(margin + places[0] * cell - 1, margin + places[0] * cell - 1, places.length * cell + 2, places.length * cell + 2);
        } else {
          for (const p of places) for (const q of places) if (p !== q) context.strokeRect(margin + q * cell - 1, margin + p * cell - 1, cell + 2, cell + 2);
        }
      }
    }

    if (showLabels) {
      context.fillStyle = '#4a525c';
      context.font = `${Math.min(12, Math.floor(cell * 0.8))}px "Source Sans 3", sans-serif`;
      context.textBaseline = 'middle';
      context.textAlign = 'right';
      for (let row = 0; row < m; row++) context.fillText(data.items[order[row]].id, margin - 6, margin + (row + 0.5) * cell, margin - 10);
      context.textAlign = 'left';
      for (let column = 0; column < m; column++) {
        context.save();
        context.translate(margin + (column + 0.5) * cell, margin - 6);
        context.rotate(-Math.PI / 2);
        context.fillText(data.items[order[column]].id, 0, 0, margin - 10);
        context.restore();
      }
    }
    canvas.dataset.drawMs = (performance.now() - started).toFixed(2);
  }, [data, dense, ordering, size, margin, threshold, highlight, outlines, showLabels]);

  // The pointer layer: the hovered row and column, the keyboard focus, the opened pair. Drawn
  // straight from the pointer's animation frame (hoverNow), so the crosshair never waits for
  // React to render the hover card; the effect redraws it when anything else changes.
  const drawOverlay = useCallback(() => {
    const canvas = overlay.current;
    if (!canvas || m === 0) return;
    const hover = hoverNow.current;
    const started = performance.now();
    const context = clearedContext(canvas, size + margin);
    if (!context) return;
    const mark = (target: Cell, colour: string, dashed: boolean) => {
      context.fillStyle = 'rgba(28, 33, 39, 0.1)';
      context.fillRect(margin, margin + target.row * cell, size, cell);
      context.fillRect(margin + target.column * cell, margin, cell, size);
      context.setLineDash(dashed ? [3, 2] : []);
      context.strokeStyle = colour;
      context.lineWidth = 2;
      const pad = Math.max(2, cell * 0.15);
      context.strokeRect(margin + target.column * cell - pad, margin + target.row * cell - pad, cell + 2 * pad, cell + 2 * pad);
      context.setLineDash([]);
    };
    if (opened) {
      const positionOf = (i: number) => order.indexOf(i);
      context.strokeStyle = '#17564a';
      context.lineWidth = 3;
      const pad = Math.max(2, cell * 0.2);
      context.strokeRect(margin + positionOf(opened.b) * cell - pad, margin + positionOf(opened.a) * cell - pad, cell + 2 * pad, cell + 2 * pad);
    }
    if (keyboard) mark(focus, '#17564a', true);
    if (hover) mark(hover, '#1c2127', false);
    // For the browser test's frame-time figures: when this layer was last drawn and how long it took.
    canvas.dataset.drawnAt = performance.now().toFixed(2);
    canvas.dataset.drawMs = (performance.now() - started).toFixed(2);
  }, [focus, keyboard, opened, size, margin, m, cell, order]);
  useEffect(() => {
    hoverNow.current = hover;
    drawOverlay();
  }, [hover, drawOverlay]);

  const cellAt = useCallback(
    (x: number, y: number): Cell | null => {
      const column = Math.floor((x - margin) / cell);
      const row = Math.floor((y - margin) / cell);
      return row >= 0 && column >= 0 && row < m && column < m ? { row, column } : null;
    },
    [margin, cell, m],
  );

  // The canvas's place on screen, measured once and again only after a scroll or resize: asking
  // for it on every pointer move would force a layout of the whole page (a 300-row item table).
  const boxNow = useRef<DOMRect | null>(null);
  useEffect(() => {
    const forget = () => (boxNow.current = null);
    window.addEventListener('scroll', forget, { passive: true, capture: true });
    window.addEventListener('resize', forget);
    return () => {
      window.removeEventListener('scroll', forget, { capture: true });
      window.removeEventListener('resize', forget);
    };
  }, []);
  useEffect(() => {
    boxNow.current = null;
  }, [size, margin]);

  const onPointerMove = (event: React.PointerEvent<HTMLCanvasElement>) => {
    boxNow.current ??= event.currentTarget.getBoundingClientRect();
    const box = boxNow.current;
    pending.current = { x: event.clientX - box.left, y: event.clientY - box.top };
    if (frame.current) return;
    frame.current = requestAnimationFrame(() => {
      frame.current = 0;
      const point = pending.current;
      if (!point) return;
      const next = cellAt(point.x, point.y);
      const previous = hoverNow.current;
      if (previous?.row === next?.row && previous?.column === next?.column) return;
      hoverNow.current = next;
      drawOverlay();
      setHover(next);
    });
  };

  const describe = useCallback(
    (target: Cell) => {
      if (!data) return '';
      const i = order[target.row];
      const j = order[target.column];
      if (i === j) return `${data.items[i].id} with itself.`;
      const r = mapCorrelation(data, i, j);
      const pair = evidence.get(`${Math.min(i, j)}:${Math.max(i, j)}`);
      const strong = r !== null && Math.abs(r) >= threshold;
      return `Row ${target.row + 1} ${data.items[i].id}, column ${target.column + 1} ${data.items[j].id}: r ${format(r)}${strong ? ', at or above the threshold' : ''}${pair ? ', flagged pair' : ''}. Press Enter to open the pair.`;
    },
    [data, order, evidence, threshold],
  );

  const onKeyDown = (event: React.KeyboardEvent<HTMLDivElement>) => {
    if (!data) return;
    const moves: Record<string, [number, number]> = { ArrowUp: [-1, 0], ArrowDown: [1, 0], ArrowLeft: [0, -1], ArrowRight: [0, 1] };
    if (event.key in moves) {
      event.preventDefault();
      const [dr, dc] = moves[event.key];
      const next = { row: Math.max(0, Math.min(m - 1, focus.row + dr)), column: Math.max(0, Math.min(m - 1, focus.column + dc)) };
      setKeyboard(true);
      setFocus(next);
      setAnnouncement(describe(next));
    } else if (event.key === 'Home' || event.key === 'End') {
      event.preventDefault();
      const next = { row: focus.row, column: event.key === 'Home' ? 0 : m - 1 };
      setKeyboard(true);
      setFocus(next);
      setAnnouncement(describe(next));
    } else if (event.key === 'Enter' || event.key === ' ') {
      event.preventDefault();
      openCell(focus);
    } else if (event.key === 'Escape') {
      setOpened(null);
    }
  };

  const openCell = (target: Cell) => {
    if (!data) return;
    const i = order[target.row];
    const j = order[target.column];
    if (i === j) {
      setAnnouncement(`${data.items[i].id} with itself: choose a cell off the diagonal to open a pair.`);
      return;
    }
    setOpened({ a: Math.min(i, j), b: Math.max(i, j) });
    setAnnouncement(`Opened the pair ${data.items[i].id} and ${data.items[j].id}; its details follow the map.`);
  };

  if (problem) return <p className="error-text" role="alert">{problem}</p>;
  if (!data) return <p className="text-sm text-ink-soft" data-testid="overlap-map-loading">Loading the overlap map…</p>;
  if (m < 2) return <p className="empty-state">The correlation matrix has fewer than two items, so there is no map to draw.</p>;

  const hovered = hover ? { i: order[hover.row], j: order[hover.column] } : null;

  return (
    <div className="grid gap-3" data-testid="overlap-map">
      <div className="flex flex-wrap items-end gap-x-6 gap-y-3 text-sm">
        <fieldset className="flex flex-wrap items-center gap-x-3 gap-y-1">
          <legend className="mb-1 font-semibold">Order the items</legend>
          {(Object.keys(orderingLabels) as MapOrdering[]).map((key) => (
            <label key={key} className="inline-flex items-center gap-1.5">
              <input type="radio" name={`map-order-${auditId}`} value={key} checked={ordering === key} onChange={() => setOrdering(key)} data-testid={`map-order-${key}`} />
              {orderingLabels[key]}
            </label>
          ))}
        </fieldset>
        <label className="grid gap-1">
          <span className="font-semibold">
            Highlight |r| at or above <output data-testid="map-threshold-value">{threshold.toFixed(2)}</output>
          </span>
          <input type="range" min={0.3} max={1} step={0.01} value={threshold} onChange={(event) => setThreshold(Number(event.target.value))} data-testid="map-threshold" aria-describedby={`map-threshold-count-${auditId}`} />
          <span id={`map-threshold-count-${auditId}`} className="text-ink-faint" data-testid="map-threshold-count">
            {aboveThreshold} {aboveThreshold === 1 ? 'pair' : 'pairs'} at or above
          </span>
        </label>
        <div className="grid gap-1">
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" checked={highlight} onChange={(event) => setHighlight(event.target.checked)} /> Fade the pairs below it
          </label>
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" checked={outlines} onChange={(event) => setOutlines(event.target.checked)} /> Outline the overlap clusters ({data.clusters.length})
          </label>
        </div>
      </div>

      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 lg:grid-cols-[minmax(0,1fr)_18rem]">
        <div ref={wrapper} className="min-w-0">
          <div
            className="relative focus:outline-none focus-visible:ring-2 focus-visible:ring-spruce-600"
            style={{ width: size + margin, height: size + margin }}
            tabIndex={0}
            role="application"
            aria-roledescription="correlation map"
            aria-label={`Overlap map of ${m} items, ${orderingLabels[ordering].toLowerCase()}. Arrow keys move cell by cell, Enter opens the pair, Escape closes it.`}
            onKeyDown={onKeyDown}
            onFocus={() => setAnnouncement(describe(focus))}
            data-testid="overlap-map-grid"
            data-margin={margin}
            data-cell={cell}
            data-order={order.map((i) => data.items[i].id).join(' ')}
          >
            <canvas ref={base} className="absolute inset-0" style={{ width: size + margin, height: size + margin }} data-testid="overlap-map-canvas" aria-hidden="true" />
            <canvas
              ref={overlay}
              className="absolute inset-0 cursor-crosshair"
              style={{ width: size + margin, height: size + margin }}
              onPointerMove={onPointerMove}
              onPointerLeave={() => {
                pending.current = null;
                hoverNow.current = null;
                drawOverlay();
                setHover(null);
              }}
              onClick={(event) => {
                const box = event.currentTarget.getBoundingClientRect();
                const target = cellAt(event.clientX - box.left, event.clientY - box.top);
                if (target) {
                  setFocus(target);
                  openCell(target);
                }
              }}
              data-testid="overlap-map-pointer"
              aria-hidden="true"
            />
          </div>
          <p className="sr-only" aria-live="polite" data-testid="overlap-map-announcement">{announcement}</p>
          <Legend />
        </div>
        <aside className="panel min-h-48 p-3 text-sm" data-testid="overlap-map-hover" aria-hidden="true">
          {hovered && hovered.i !== hovered.j ? (
            <HoverCard data={data} i={hovered.i} j={hovered.j} evidence={evidence.get(`${Math.min(hovered.i, hovered.j)}:${Math.max(hovered.i, hovered.j)}`) ?? null} cluster={clusterOf.get(hovered.i) !== undefined && clusterOf.get(hovered.i) === clusterOf.get(hovered.j) ? clusterOf.get(hovered.i)! : null} />
          ) : (
            <p className="text-ink-soft">Point at a cell to read the pair; click it to open the crosstab, the evidence and the recommendation. With the keyboard: focus the map, then the arrow keys and Enter.</p>
          )}
        </aside>
      </div>

      {opened && <PairDetail key={`${opened.a}:${opened.b}`} auditId={auditId} data={data} a={opened.a} b={opened.b} evidence={evidence.get(`${opened.a}:${opened.b}`) ?? null} onClose={() => setOpened(null)} />}
    </div>
  );
}

const Legend = memo(function Legend() {
  const stops = Array.from({ length: 21 }, (_, k) => -1 + k * 0.1);
  return (
    <figure className="mt-3 max-w-md text-xs text-ink-soft" data-testid="overlap-map-legend">
      <div className="flex h-3 overflow-hidden rounded-sm border border-rule" aria-hidden="true">
        {stops.map((r) => (
          <span key={r.toFixed(1)} className="flex-1" style={{ background: colourOf(r) }} />
        ))}
      </div>
      <div className="mt-0.5 flex justify-between num" aria-hidden="true">
        <span>−1</span>
        <span>−0.5</span>
        <span>0</span>
        <span>0.5</span>
        <span>1</span>
      </div>
      <figcaption className="mt-1">
        Correlation r: indigo for negative, paper for none, rust for positive; darker is stronger. Grey diagonal: an item with itself. Black outlines: overlap clusters. Dots: pairs at or above the threshold.
      </figcaption>
    </figure>
  );
});

/**
 * A canvas's 2D context sized for a square of `side` CSS pixels at the screen's pixel ratio,
 * scaled to CSS pixels and cleared; null when the browser gives no 2D context.
 */
function clearedContext(canvas: HTMLCanvasElement, side: number): CanvasRenderingContext2D | null {
  const ratio = window.devicePixelRatio || 1;
  const pixels = Math.round(side * ratio);
  if (canvas.width !== pixels) {
    canvas.width = pixels;
    canvas.height = pixels;
  }
  const context = canvas.getContext('2d');
  if (!context) return null;
  context.setTransform(ratio, 0, 0, ratio, 0, 0);
  context.clearRect(0, 0, side, side);
  return context;
}
