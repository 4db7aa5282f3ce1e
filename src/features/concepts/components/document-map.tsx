import {
  type KeyboardEvent,
  type PointerEvent,
  useCallback,
  useEffect,
  useId,
  useMemo,
  useRef,
  useState,
} from 'react';
import type { MapResponse } from '@shared/schemas/concepts';
import { Button } from '@/components/ui';
import { cn } from '@/lib/cn';
import {
  type ColourBy,
  type MapCategory,
  type MapShape,
  type MapView,
  type PreparedMap,
  hitTest,
  prepareMap,
  traceShape,
  transformFor,
  zoomAt,
} from '../map-model';

const HEIGHT = 560;
const HIT_RADIUS = 8;
const HOME: MapView = { zoom: 1, panX: 0, panY: 0 };

export interface AxisEnds {
  /** What lies at the positive and negative ends, e.g. the strongest terms. */
  positive: string;
  negative: string;
  label: string;
}

/**
 * Every document of the index as one mark on a <canvas>: one path and one fill per
 * category (so 100,000 points are one pass over typed arrays), device-pixel-ratio
 * aware, a uniform grid for hover and click hit-testing, wheel or keys to zoom, drag
 * or arrows to pan. A second canvas on top carries only the hover ring and the
 * keyboard cursor, so moving the pointer never redraws the points.
 */
export function DocumentMap({
  data,
  colourBy,
  axes,
  onOpen,
}: {
  data: MapResponse;
  colourBy: ColourBy;
  axes: { x: AxisEnds; y: AxisEnds };
  onOpen: (documentId: number) => void;
}) {
  const instructionsId = useId();
  const wrapRef = useRef<HTMLDivElement>(null);
  const pointsRef = useRef<HTMLCanvasElement>(null);
  const overlayRef = useRef<HTMLCanvasElement>(null);
  const [width, setWidth] = useState(0);
  const [view, setView] = useState<MapView>(HOME);
  const [hidden, setHidden] = useState<ReadonlySet<number>>(() => new Set());
  const [hovered, setHovered] = useState(-1);
  const [pointer, setPointer] = useState<{ x: number; y: number } | null>(null);
  const [keyCursor, setKeyCursor] = useState<{ x: number; y: number } | null>(null);
  const [drawn, setDrawn] = useState(0);
  const [drawMs, setDrawMs] = useState(0);
  const drag = useRef<{ x: number; y: number; panX: number; panY: number; moved: boolean } | null>(
    null,
  );

  const map = useMemo(() => prepareMap(data, colourBy), [data, colourBy]);
  // A new answer or colouring: start from the whole map again.
  useEffect(() => {
    setHidden(new Set());
    setHovered(-1);
  }, [map]);
  useEffect(() => setView(HOME), [data]);

  useEffect(() => {
    const wrap = wrapRef.current;
    if (!wrap) return;
    const observer = new ResizeObserver((entries) => {
      setWidth(Math.floor(entries[0].contentRect.width));
    });
    observer.observe(wrap);
    return () => observer.disconnect();
  }, []);

  const transform = useMemo(
    () => transformFor(width || 1, HEIGHT, map.bounds, view),
    [width, map, view],
  );
  const radius = map.count > 20_000 ? 1.8 : map.count > 2_000 ? 2.6 : 3.6;

  // The one draw pass over every point.
  useEffect(() => {
    const canvas = pointsRef.current;
    if (!canvas || width === 0) return;
    const started = performance.now();
    const count = drawPoints(canvas, map, transform, hidden, width, HEIGHT, radius, axes);
    setDrawn(count);
    setDrawMs(performance.now() - started);
  }, [map, transform, hidden, width, radius, axes]);

  const hoverAt = keyCursor ?? pointer;
  useEffect(() => {
    const canvas = overlayRef.current;
    if (!canvas || width === 0) return;
    drawOverlay(canvas, map, transform, hovered, keyCursor, width, HEIGHT, radius);
  }, [map, transform, hovered, keyCursor, width, radius]);

  useEffect(() => {
    if (!hoverAt) {
      setHovered(-1);
      return;
    }
    setHovered(hitTest(map, transform, hidden, hoverAt.x, hoverAt.y, keyCursor ? 22 : HIT_RADIUS));
  }, [hoverAt, keyCursor, map, transform, hidden]);

  // Wheel zoom needs a non-passive listener to keep the page from scrolling.
  useEffect(() => {
    const canvas = overlayRef.current;
    if (!canvas) return;
    const onWheel = (event: WheelEvent) => {
      event.preventDefault();
      const rect = canvas.getBoundingClientRect();
      const factor = Math.exp(-event.deltaY * 0.0015);
      setView((v) =>
        zoomAt(
          v,
          factor,
          event.clientX - rect.left,
          event.clientY - rect.top,
          rect.width,
          HEIGHT,
          map.bounds,
        ),
      );
    };
    canvas.addEventListener('wheel', onWheel, { passive: false });
    return () => canvas.removeEventListener('wheel', onWheel);
  }, [map]);

  const localPoint = (event: PointerEvent<HTMLCanvasElement>) => {
    const rect = event.currentTarget.getBoundingClientRect();
    return { x: event.clientX - rect.left, y: event.clientY - rect.top };
  };

  function onPointerDown(event: PointerEvent<HTMLCanvasElement>) {
    const p = localPoint(event);
    drag.current = { ...p, panX: view.panX, panY: view.panY, moved: false };
    event.currentTarget.setPointerCapture(event.pointerId);
  }
  function onPointerMove(event: PointerEvent<HTMLCanvasElement>) {
    const p = localPoint(event);
    setKeyCursor(null);
    const d = drag.current;
    if (d) {
      const dx = p.x - d.x;
      const dy = p.y - d.y;
      if (d.moved || Math.abs(dx) + Math.abs(dy) > 4) {
        d.moved = true;
        setView((v) => ({ ...v, panX: d.panX + dx, panY: d.panY + dy }));
        return;
      }
    }
    setPointer(p);
  }
  function onPointerUp(event: PointerEvent<HTMLCanvasElement>) {
    const d = drag.current;
    drag.current = null;
    if (d?.moved) return;
    const p = localPoint(event);
    const hit = hitTest(map, transform, hidden, p.x, p.y, HIT_RADIUS);
    if (hit >= 0) onOpen(data.ids[hit]);
  }

  const zoomBy = useCallback(
    (factor: number) =>
      setView((v) =>
        zoomAt(v, factor, (width || 1) / 2, HEIGHT / 2, width || 1, HEIGHT, map.bounds),
      ),
    [width, map],
  );

  function onKeyDown(event: KeyboardEvent<HTMLCanvasElement>) {
    const step = event.shiftKey ? 64 : 16;
    const cursor = keyCursor ?? { x: (width || 1) / 2, y: HEIGHT / 2 };
    const move = (dx: number, dy: number) =>
      setKeyCursor({
        x: Math.min(Math.max(cursor.x + dx, 0), width || 1),
        y: Math.min(Math.max(cursor.y + dy, 0), HEIGHT),
      });
    switch (event.key) {
      case 'ArrowLeft':
        move(-step, 0);
        break;
      case 'ArrowRight':
        move(step, 0);
        break;
      case 'ArrowUp':
        move(0, -step);
        break;
      case 'ArrowDown':
        move(0, step);
        break;
      case '+':
      case '=':
        zoomBy(1.5);
        break;
      case '-':
        zoomBy(1 / 1.5);
        break;
      case '0':
        setView(HOME);
        break;
      case 'Enter':
        if (hovered >= 0) onOpen(data.ids[hovered]);
        break;
      case 'Escape':
        setKeyCursor(null);
        break;
      default:
        return;
    }
    event.preventDefault();
  }

  const tipAt = hovered >= 0 ? screenOf(map, transform, hovered) : null;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-2">
        <div role="group" aria-label="Zoom" className="flex gap-1">
          <Button size="sm" onClick={() => zoomBy(1.5)} aria-label="Zoom in">
            +
          </Button>
          <Button
            size="sm"
            onClick={() => zoomBy(1 / 1.5)}
            aria-label="Zoom out"
            disabled={view.zoom <= 1}
          >
            −
          </Button>
          <Button
            size="sm"
            onClick={() => setView(HOME)}
            disabled={view.zoom === 1 && view.panX === 0 && view.panY === 0}
          >
            Whole map
          </Button>
        </div>
        <span className="text-xs text-ink-muted tabular-nums" aria-live="polite">
          {drawn.toLocaleString()} of {map.count.toLocaleString()} documents drawn
          {view.zoom > 1 ? ` · zoom ×${view.zoom.toFixed(1)}` : ''}
        </span>
        <span className="ml-auto text-xs text-ink-muted">
          Across → dimension {data.dims[0]}
          {axes.x.label ? ` (${axes.x.label})` : ''} · up ↑ dimension {data.dims[1]}
          {axes.y.label ? ` (${axes.y.label})` : ''}
        </span>
      </div>
      <div
        ref={wrapRef}
        className="relative w-full overflow-hidden rounded-md border border-line bg-panel"
        style={{ height: HEIGHT }}
      >
        <canvas
          ref={pointsRef}
          className="absolute inset-0"
          style={{ width: '100%', height: HEIGHT }}
          data-testid="document-map-canvas"
          data-points={drawn}
          data-total={map.count}
          data-draw-ms={drawMs.toFixed(1)}
          data-sample={sampleOf(map, transform, data)}
          aria-hidden="true"
        />
        <canvas
          ref={overlayRef}
          tabIndex={0}
          role="img"
          aria-label={`Document map: ${map.count} documents on dimension ${data.dims[0]} (across) and dimension ${data.dims[1]} (up).`}
          aria-describedby={instructionsId}
          className={cn(
            'absolute inset-0 touch-none',
            hovered >= 0
              ? 'cursor-pointer'
              : drag.current?.moved
                ? 'cursor-grabbing'
                : 'cursor-crosshair',
          )}
          style={{ width: '100%', height: HEIGHT }}
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={onPointerUp}
          onPointerLeave={() => {
            if (!drag.current) setPointer(null);
          }}
          onKeyDown={onKeyDown}
          onBlur={() => setKeyCursor(null)}
          data-testid="document-map"
        />
        {hovered >= 0 && tipAt ? (
          <MapTooltip data={data} index={hovered} x={tipAt.x} y={tipAt.y} width={width} />
        ) : null}
      </div>
      <p id={instructionsId} className="text-xs text-ink-muted">
        Point at a mark for its document; click it (or press Enter) to open it. Scroll or use + and
        − to zoom, drag to pan, 0 for the whole map. From the keyboard, focus the map and move the
        cursor with the arrow keys (Shift for larger steps).
      </p>
      <div className="sr-only" aria-live="polite">
        {hovered >= 0
          ? `${data.controlNumbers[hovered]}, ${data.titles[hovered]}. Press Enter to open.`
          : ''}
      </div>
      <Legend
        categories={map.categories}
        hidden={hidden}
        colourBy={colourBy}
        onToggle={(index) =>
          setHidden((previous) => {
            const next = new Set(previous);
            if (next.has(index)) next.delete(index);
            else next.add(index);
            return next;
          })
        }
      />
    </div>
  );
}

function screenOf(map: PreparedMap, t: ReturnType<typeof transformFor>, i: number) {
  return { x: t.ox + map.x[i] * t.scaleX, y: t.oy - map.y[i] * t.scaleY };
}

/** Where the first document sits on screen, for tests and tools ("x,y,documentId"). */
function sampleOf(map: PreparedMap, t: ReturnType<typeof transformFor>, data: MapResponse) {
  if (map.count === 0) return undefined;
  const p = screenOf(map, t, 0);
  return `${p.x.toFixed(1)},${p.y.toFixed(1)},${data.ids[0]}`;
}

function sizeCanvas(canvas: HTMLCanvasElement, width: number, height: number) {
  const dpr = window.devicePixelRatio || 1;
  const w = Math.round(width * dpr);
  const h = Math.round(height * dpr);
  if (canvas.width !== w) canvas.width = w;
  if (canvas.height !== h) canvas.height = h;
  const ctx = canvas.getContext('2d');
  if (!ctx) return null;
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
  ctx.clearRect(0, 0, width, height);
  return ctx;
}

function drawPoints(
  canvas: HTMLCanvasElement,
  map: PreparedMap,
  t: ReturnType<typeof transformFor>,
  hidden: ReadonlySet<number>,
  width: number,
  height: number,
  r: number,
  axes: { x: AxisEnds; y: AxisEnds },
): number {
  const ctx = sizeCanvas(canvas, width, height);
  if (!ctx) return 0;
  const dpr = window.devicePixelRatio || 1;
  const W = canvas.width;
  const H = canvas.height;

  // The points go straight into one pixel buffer (a typed array): each category's mark
  // is rasterised once as a coverage mask and blended in at every point, then the
  // buffer is put on the canvas in one call. Filling one path of 100,000 sub-paths, or
  // 100,000 drawImage calls, is one to two orders of magnitude slower without a GPU.
  const image = ctx.createImageData(W, H);
  const px = image.data;
  px.fill(255); // opaque white: the panel colour
  const alpha = map.count > 20_000 ? 0.6 : 0.85;
  // Largest categories first, so small ones stay on top and visible.
  const order = map.categories
    .map((category, index) => ({ index, count: category.count }))
    .sort((a, b) => b.count - a.count);
  let drawn = 0;
  for (const { index } of order) {
    if (hidden.has(index)) continue;
    const category = map.categories[index];
    const mask = maskFor(category.shape, r, dpr);
    const [cr, cg, cb] = rgbOf(category.colour);
    const size = mask.size;
    const half = size / 2;
    for (let k = map.catStart[index]; k < map.catStart[index + 1]; k++) {
      const i = map.order[k];
      const x0 = Math.round((t.ox + map.x[i] * t.scaleX) * dpr - half);
      const y0 = Math.round((t.oy - map.y[i] * t.scaleY) * dpr - half);
      if (x0 <= -size || y0 <= -size || x0 >= W || y0 >= H) continue;
      drawn++;
      for (let my = 0; my < size; my++) {
        const y = y0 + my;
        if (y < 0 || y >= H) continue;
        const row = y * W;
        const mrow = my * size;
        for (let mx = 0; mx < size; mx++) {
          const cover = mask.cover[mrow + mx];
          if (cover === 0) continue;
          const x = x0 + mx;
          if (x < 0 || x >= W) continue;
          const a = cover * alpha;
          const o = (row + x) * 4;
          px[o] += (cr - px[o]) * a;
          px[o + 1] += (cg - px[o + 1]) * a;
          px[o + 2] += (cb - px[o + 2]) * a;
        }
      }
    }
  }
  ctx.putImageData(image, 0, 0);

  // Axes through the origin, with their ticks and what lies at each end.
  ctx.strokeStyle = '#b9b2a3';
  ctx.lineWidth = 1;
  ctx.setLineDash([4, 4]);
  ctx.beginPath();
  ctx.moveTo(0, Math.round(t.oy) + 0.5);
  ctx.lineTo(width, Math.round(t.oy) + 0.5);
  ctx.moveTo(Math.round(t.ox) + 0.5, 0);
  ctx.lineTo(Math.round(t.ox) + 0.5, height);
  ctx.stroke();
  ctx.setLineDash([]);
  ctx.fillStyle = '#545b63';
  ctx.font = '11px "Inter Variable", system-ui, sans-serif';
  drawTicks(ctx, t, width, height);
  const clampY = (y: number) => Math.min(Math.max(y, 14), height - 22);
  const clampX = (x: number) => Math.min(Math.max(x, 6), width - 6);
  const end = (text: string, sign: string, x: number, y: number, align: CanvasTextAlign) => {
    if (!text) return;
    // A label that would run off the right edge is right-aligned to it instead.
    if (align === 'left' && x + ctx.measureText(`${sign} ${text}`).width > width - 8) {
      align = 'right';
      x = width - 8;
    }
    ctx.textAlign = align;
    haloText(ctx, `${sign} ${text}`, x, y);
  };
  end(axes.x.positive, '+', width - 8, clampY(t.oy - 6), 'right');
  end(axes.x.negative, '−', 8, clampY(t.oy - 6), 'left');
  end(axes.y.positive, '+', clampX(t.ox + 6), 30, 'left');
  end(axes.y.negative, '−', clampX(t.ox + 6), height - 22, 'left');
  return drawn;
}

const masks = new Map<string, { size: number; cover: Float32Array }>();

/** A mark's coverage (0..1 per device pixel), rasterised once by the canvas itself. */
function maskFor(shape: MapShape, r: number, dpr: number) {
  const key = `${shape}|${r}|${dpr}`;
  const cached = masks.get(key);
  if (cached) return cached;
  const size = Math.ceil((r * 2.6 + 2) * dpr);
  const canvas = document.createElement('canvas');
  canvas.width = size;
  canvas.height = size;
  const ctx = canvas.getContext('2d', { willReadFrequently: true });
  const cover = new Float32Array(size * size);
  if (ctx) {
    ctx.scale(dpr, dpr);
    ctx.fillStyle = '#000';
    ctx.beginPath();
    traceShape(ctx, shape, size / dpr / 2, size / dpr / 2, r);
    ctx.fill();
    const pixels = ctx.getImageData(0, 0, size, size).data;
    for (let i = 0; i < size * size; i++) cover[i] = pixels[i * 4 + 3] / 255;
  }
  const mask = { size, cover };
  masks.set(key, mask);
  return mask;
}

function rgbOf(hex: string): [number, number, number] {
  const value = parseInt(hex.slice(1), 16);
  return [(value >> 16) & 255, (value >> 8) & 255, value & 255];
}

/** Tick marks with their cosine values along both axes, spaced for the zoom level. */
function drawTicks(
  ctx: CanvasRenderingContext2D,
  t: ReturnType<typeof transformFor>,
  width: number,
  height: number,
) {
  const stepFor = (scale: number) =>
    [0.05, 0.1, 0.25, 0.5, 1].find((step) => step * scale >= 70) ?? 1;
  const axisY = Math.min(Math.max(t.oy, 0), height - 14);
  const axisX = Math.min(Math.max(t.ox, 0), width - 30);
  ctx.textAlign = 'center';
  const sx = stepFor(t.scaleX);
  for (let v = Math.ceil(-t.ox / t.scaleX / sx) * sx; t.ox + v * t.scaleX < width; v += sx) {
    if (Math.abs(v) < 1e-9) continue;
    const x = t.ox + v * t.scaleX;
    ctx.fillRect(Math.round(x), axisY - 3, 1, 6);
    haloText(ctx, formatTick(v), x, axisY + 15);
  }
  ctx.textAlign = 'left';
  const sy = stepFor(t.scaleY);
  for (let v = Math.ceil((t.oy - height) / t.scaleY / sy) * sy; t.oy - v * t.scaleY > 0; v += sy) {
    if (Math.abs(v) < 1e-9) continue;
    const y = t.oy - v * t.scaleY;
    ctx.fillRect(axisX - 3, Math.round(y), 6, 1);
    haloText(ctx, formatTick(v), axisX + 6, y + 4);
  }
}

/** Text with a white halo, so it stays readable over dense marks. */
function haloText(ctx: CanvasRenderingContext2D, text: string, x: number, y: number) {
  ctx.save();
  ctx.strokeStyle = 'rgba(255, 255, 255, 0.9)';
  ctx.lineWidth = 3;
  ctx.lineJoin = 'round';
  ctx.strokeText(text, x, y);
  ctx.restore();
  ctx.fillText(text, x, y);
}

function formatTick(value: number): string {
  return Number(value.toFixed(2)).toString().replace('-', '−');
}

function drawOverlay(
  canvas: HTMLCanvasElement,
  map: PreparedMap,
  t: ReturnType<typeof transformFor>,
  hovered: number,
  cursor: { x: number; y: number } | null,
  width: number,
  height: number,
  r: number,
) {
  const ctx = sizeCanvas(canvas, width, height);
  if (!ctx) return;
  if (cursor) {
    ctx.strokeStyle = '#c2710c';
    ctx.lineWidth = 1.5;
    ctx.beginPath();
    ctx.arc(cursor.x, cursor.y, 22, 0, Math.PI * 2);
    ctx.moveTo(cursor.x - 6, cursor.y);
    ctx.lineTo(cursor.x + 6, cursor.y);
    ctx.moveTo(cursor.x, cursor.y - 6);
    ctx.lineTo(cursor.x, cursor.y + 6);
    ctx.stroke();
  }
  if (hovered >= 0) {
    const p = screenOf(map, t, hovered);
    const category = map.categories[map.category[hovered]];
    ctx.fillStyle = category.colour;
    ctx.beginPath();
    traceShape(ctx, category.shape, p.x, p.y, r + 2);
    ctx.fill();
    ctx.strokeStyle = '#1f2328';
    ctx.lineWidth = 2;
    ctx.beginPath();
    ctx.arc(p.x, p.y, r + 6, 0, Math.PI * 2);
    ctx.stroke();
  }
}

function MapTooltip({
  data,
  index,
  x,
  y,
  width,
}: {
  data: MapResponse;
  index: number;
  x: number;
  y: number;
  width: number;
}) {
  const custodian = data.custodians[data.custodian[index]]?.name ?? 'No custodian';
  const codeNames = (data.codeIds[index] ?? [])
    .map((id) => data.codes.find((code) => code.id === id)?.name)
    .filter(Boolean)
    .join(', ');
  const left = x > width - 300 ? x - 292 : x + 14;
  const top = Math.min(Math.max(y - 12, 4), HEIGHT - 120);
  return (
    <div
      className="pointer-events-none absolute z-10 w-[280px] rounded-md border border-line-strong bg-panel px-3 py-2 text-[13px] shadow-lg"
      style={{ left, top }}
      data-testid="map-tooltip"
      data-document-id={data.ids[index]}
    >
      <p className="font-mono text-xs font-semibold" data-testid="map-tooltip-control">
        {data.controlNumbers[index]}
      </p>
      <p className="line-clamp-2 leading-snug font-medium">{data.titles[index] || 'Untitled'}</p>
      <p className="mt-0.5 text-xs text-ink-muted">Custodian: {custodian}</p>
      <p className="text-xs text-ink-muted">Codes: {codeNames || 'none'}</p>
      {data.foldedIn[index] ? (
        <p className="text-xs text-ink-muted">Folded in after the build</p>
      ) : null}
      <p className="mt-0.5 text-xs text-ink-muted tabular-nums">
        ({data.x[index].toFixed(3)}, {data.y[index].toFixed(3)}) · click to open
      </p>
    </div>
  );
}

/** The legend: each category's mark, colour, name and count; a button shows or hides it. */
function Legend({
  categories,
  hidden,
  colourBy,
  onToggle,
}: {
  categories: MapCategory[];
  hidden: ReadonlySet<number>;
  colourBy: ColourBy;
  onToggle: (index: number) => void;
}) {
  return (
    <section aria-label="Legend" data-testid="map-legend">
      <h3 className="mb-1 text-xs font-semibold tracking-wide text-ink-muted uppercase">
        {colourBy === 'custodian'
          ? 'Custodians'
          : 'Codes (a document takes its first code in the code set’s order)'}
      </h3>
      <ul className="flex flex-wrap gap-1.5">
        {categories.map((category, index) => {
          const off = hidden.has(index);
          return (
            <li key={category.name}>
              <button
                type="button"
                aria-pressed={!off}
                onClick={() => onToggle(index)}
                className={cn(
                  'flex items-center gap-1.5 rounded border px-2 py-0.5 text-[13px]',
                  off
                    ? 'border-line bg-sunk text-ink-muted line-through'
                    : 'border-line-strong bg-panel',
                )}
                title={off ? 'Show on the map' : 'Hide from the map'}
              >
                <ShapeSwatch shape={category.shape} colour={category.colour} dim={off} />
                <span>{category.name}</span>
                <span className="text-xs text-ink-muted tabular-nums">
                  {category.count.toLocaleString()}
                </span>
              </button>
            </li>
          );
        })}
      </ul>
    </section>
  );
}

function ShapeSwatch({ shape, colour, dim }: { shape: MapShape; colour: string; dim: boolean }) {
  const ref = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    const canvas = ref.current;
    if (!canvas) return;
    const ctx = sizeCanvas(canvas, 14, 14);
    if (!ctx) return;
    ctx.globalAlpha = dim ? 0.35 : 1;
    ctx.fillStyle = colour;
    ctx.beginPath();
    traceShape(ctx, shape, 7, 7, 4.6);
    ctx.fill();
  }, [shape, colour, dim]);
  return <canvas ref={ref} aria-hidden="true" style={{ width: 14, height: 14 }} />;
}
