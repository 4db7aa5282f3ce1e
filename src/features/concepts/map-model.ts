import type { MapResponse } from '@shared/schemas/concepts';

// The document map's data, prepared once per answer: typed arrays for one draw pass,
// points ordered by category (one path and one fill per category), and a uniform grid
// over the data plane for hit-testing in O(points near the cursor) rather than O(n).

/**
 * Okabe and Ito (2008), "Color Universal Design": eight colours told apart by people
 * with the common colour-vision deficiencies. Yellow goes last: it is faint on white.
 */
export const MAP_COLOURS = [
  '#0072B2',
  '#D55E00',
  '#009E73',
  '#CC79A7',
  '#E69F00',
  '#56B4E9',
  '#000000',
  '#F0E442',
] as const;

/** Every category also has its own mark, so the map reads without colour. */
export const MAP_SHAPES = [
  'circle',
  'square',
  'triangle',
  'diamond',
  'cross',
  'triangle-down',
  'plus',
] as const;
export type MapShape = (typeof MAP_SHAPES)[number];

export type ColourBy = 'custodian' | 'code';

export interface MapCategory {
  name: string;
  count: number;
  colour: string;
  shape: MapShape;
}

export interface PreparedMap {
  count: number;
  x: Float32Array;
  y: Float32Array;
  /** Category of each point. */
  category: Uint16Array;
  categories: MapCategory[];
  /** Point indices grouped by category: order[catStart[c] .. catStart[c + 1]). */
  order: Int32Array;
  catStart: Int32Array;
  bounds: { minX: number; maxX: number; minY: number; maxY: number };
  grid: MapGrid;
}

export interface MapGrid {
  cells: number;
  minX: number;
  minY: number;
  cellW: number;
  cellH: number;
  /** Points of cell c are items[cellStart[c] .. cellStart[c + 1]). */
  cellStart: Int32Array;
  items: Int32Array;
}

/** Category of each document: its custodian, or its first code in the code set's order. */
function categorise(data: MapResponse, colourBy: ColourBy) {
  const n = data.count;
  const category = new Uint16Array(n);
  const names: string[] = [];
  if (colourBy === 'custodian') {
    names.push(...data.custodians.map((c) => c.name));
    const none = names.length;
    let anyNone = false;
    for (let i = 0; i < n; i++) {
      const c = data.custodian[i];
      if (c >= 0 && c < none) category[i] = c;
      else {
        category[i] = none;
        anyNone = true;
      }
    }
    if (anyNone) names.push('No custodian');
  } else {
    const position = new Map<number, number>();
    data.codes.forEach((code, index) => {
      position.set(code.id, index);
      names.push(code.name);
    });
    const uncoded = names.length;
    let anyUncoded = false;
    for (let i = 0; i < n; i++) {
      let best = uncoded;
      for (const id of data.codeIds[i] ?? []) {
        const p = position.get(id);
        if (p != null && p < best) best = p;
      }
      category[i] = best;
      if (best === uncoded) anyUncoded = true;
    }
    if (anyUncoded) names.push('Uncoded');
  }
  return { category, names };
}

export function prepareMap(data: MapResponse, colourBy: ColourBy): PreparedMap {
  const n = data.count;
  const x = Float32Array.from(data.x);
  const y = Float32Array.from(data.y);
  const { category, names } = categorise(data, colourBy);

  const counts = new Int32Array(names.length);
  for (let i = 0; i < n; i++) counts[category[i]]++;
  const catStart = new Int32Array(names.length + 1);
  for (let c = 0; c < names.length; c++) catStart[c + 1] = catStart[c] + counts[c];
  const order = new Int32Array(n);
  const fill = catStart.slice(0, names.length);
  for (let i = 0; i < n; i++) order[fill[category[i]]++] = i;

  const categories = names.map((name, index) => ({
    name,
    count: counts[index],
    colour: MAP_COLOURS[index % MAP_COLOURS.length],
    shape: MAP_SHAPES[index % MAP_SHAPES.length],
  }));

  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < n; i++) {
    if (x[i] < minX) minX = x[i];
    if (x[i] > maxX) maxX = x[i];
    if (y[i] < minY) minY = y[i];
    if (y[i] > maxY) maxY = y[i];
  }
  if (!(n > 0)) {
    minX = -1;
    maxX = 1;
    minY = -1;
    maxY = 1;
  }
  // The origin stays in view: the axes through it orient the reader.
  minX = Math.min(minX, 0);
  maxX = Math.max(maxX, 0);
  minY = Math.min(minY, 0);
  maxY = Math.max(maxY, 0);
  if (maxX - minX < 1e-6) maxX = minX + 1;
  if (maxY - minY < 1e-6) maxY = minY + 1;
  const bounds = { minX, maxX, minY, maxY };
  return {
    count: n,
    x,
    y,
    category,
    categories,
    order,
    catStart,
    bounds,
    grid: buildGrid(x, y, bounds),
  };
}

function buildGrid(x: Float32Array, y: Float32Array, b: PreparedMap['bounds']): MapGrid {
  const n = x.length;
  // About four points per cell on average.
  const cells = Math.max(8, Math.min(512, Math.ceil(Math.sqrt(n / 4))));
  const cellW = (b.maxX - b.minX) / cells;
  const cellH = (b.maxY - b.minY) / cells;
  const cellOf = new Int32Array(n);
  const cellStart = new Int32Array(cells * cells + 1);
  for (let i = 0; i < n; i++) {
    const cx = Math.min(cells - 1, Math.max(0, Math.floor((x[i] - b.minX) / cellW)));
    const cy = Math.min(cells - 1, Math.max(0, Math.floor((y[i] - b.minY) / cellH)));
    const c = cy * cells + cx;
    cellOf[i] = c;
    cellStart[c + 1]++;
  }
  for (let c = 0; c < cells * cells; c++) cellStart[c + 1] += cellStart[c];
  const items = new Int32Array(n);
  const fill = cellStart.slice(0, cells * cells);
  for (let i = 0; i < n; i++) items[fill[cellOf[i]]++] = i;
  return { cells, minX: b.minX, minY: b.minY, cellW, cellH, cellStart, items };
}

/** Screen transform: sx = ox + x * scaleX, sy = oy - y * scaleY (CSS pixels). */
export interface MapTransform {
  scaleX: number;
  scaleY: number;
  ox: number;
  oy: number;
}

export interface MapView {
  zoom: number;
  panX: number;
  panY: number;
}

export const MAP_PADDING = 28;

/**
 * Each axis is stretched to the canvas on its own: the two dimensions' spreads differ
 * (dimension 1 is mostly positive), and a map that fills its frame shows more. The
 * ticks drawn on the axes keep the scales honest.
 */
export function transformFor(
  width: number,
  height: number,
  bounds: PreparedMap['bounds'],
  view: MapView,
): MapTransform {
  const baseX = Math.max((width - 2 * MAP_PADDING) / (bounds.maxX - bounds.minX), 1e-6);
  const baseY = Math.max((height - 2 * MAP_PADDING) / (bounds.maxY - bounds.minY), 1e-6);
  const scaleX = baseX * view.zoom;
  const scaleY = baseY * view.zoom;
  const cx = (bounds.minX + bounds.maxX) / 2;
  const cy = (bounds.minY + bounds.maxY) / 2;
  return {
    scaleX,
    scaleY,
    ox: width / 2 + view.panX - cx * scaleX,
    oy: height / 2 + view.panY + cy * scaleY,
  };
}

/** The view after zooming by `factor` around the screen point (px, py). */
export function zoomAt(
  view: MapView,
  factor: number,
  px: number,
  py: number,
  width: number,
  height: number,
  bounds: PreparedMap['bounds'],
): MapView {
  const zoom = Math.min(200, Math.max(1, view.zoom * factor));
  if (zoom === 1) return { zoom: 1, panX: 0, panY: 0 };
  const t = transformFor(width, height, bounds, view);
  const dx = (px - t.ox) / t.scaleX;
  const dy = (t.oy - py) / t.scaleY;
  const scaleX = (t.scaleX / view.zoom) * zoom;
  const scaleY = (t.scaleY / view.zoom) * zoom;
  const cx = (bounds.minX + bounds.maxX) / 2;
  const cy = (bounds.minY + bounds.maxY) / 2;
  return {
    zoom,
    panX: px - dx * scaleX - width / 2 + cx * scaleX,
    panY: py + dy * scaleY - height / 2 - cy * scaleY,
  };
}

/**
 * The visible point nearest to (px, py) within `radius` screen pixels, or -1. Only the
 * grid cells the circle touches are searched.
 */
export function hitTest(
  map: PreparedMap,
  t: MapTransform,
  hidden: ReadonlySet<number>,
  px: number,
  py: number,
  radius: number,
): number {
  const g = map.grid;
  const dx = (px - t.ox) / t.scaleX;
  const dy = (t.oy - py) / t.scaleY;
  const rx = radius / t.scaleX;
  const ry = radius / t.scaleY;
  const x0 = Math.max(0, Math.floor((dx - rx - g.minX) / g.cellW));
  const x1 = Math.min(g.cells - 1, Math.floor((dx + rx - g.minX) / g.cellW));
  const y0 = Math.max(0, Math.floor((dy - ry - g.minY) / g.cellH));
  const y1 = Math.min(g.cells - 1, Math.floor((dy + ry - g.minY) / g.cellH));
  let best = -1;
  let bestD = radius * radius;
  for (let cy = y0; cy <= y1; cy++) {
    for (let cx = x0; cx <= x1; cx++) {
      const c = cy * g.cells + cx;
      for (let k = g.cellStart[c]; k < g.cellStart[c + 1]; k++) {
        const i = g.items[k];
        if (hidden.has(map.category[i])) continue;
        const ex = t.ox + map.x[i] * t.scaleX - px;
        const ey = t.oy - map.y[i] * t.scaleY - py;
        const d = ex * ex + ey * ey;
        if (d <= bestD) {
          bestD = d;
          best = i;
        }
      }
    }
  }
  return best;
}

/** Adds one mark to the current path (filled shapes) centred on (x, y). */
export function traceShape(
  ctx: CanvasRenderingContext2D,
  shape: MapShape,
  x: number,
  y: number,
  r: number,
): void {
  switch (shape) {
    case 'circle':
      ctx.moveTo(x + r, y);
      ctx.arc(x, y, r, 0, Math.PI * 2);
      break;
    case 'square':
      ctx.rect(x - r * 0.85, y - r * 0.85, r * 1.7, r * 1.7);
      break;
    case 'triangle':
      ctx.moveTo(x, y - r * 1.15);
      ctx.lineTo(x + r, y + r * 0.75);
      ctx.lineTo(x - r, y + r * 0.75);
      ctx.closePath();
      break;
    case 'triangle-down':
      // Same (clockwise) winding as every other mark: overlapping marks of one path
      // must not cancel under the non-zero fill rule.
      ctx.moveTo(x, y + r * 1.15);
      ctx.lineTo(x - r, y - r * 0.75);
      ctx.lineTo(x + r, y - r * 0.75);
      ctx.closePath();
      break;
    case 'diamond':
      ctx.moveTo(x, y - r * 1.2);
      ctx.lineTo(x + r * 1.2, y);
      ctx.lineTo(x, y + r * 1.2);
      ctx.lineTo(x - r * 1.2, y);
      ctx.closePath();
      break;
    case 'plus': {
      const w = r * 0.45;
      ctx.rect(x - r * 1.1, y - w, r * 2.2, w * 2);
      ctx.rect(x - w, y - r * 1.1, w * 2, r * 2.2);
      break;
    }
    case 'cross': {
      // An "x": two thin rotated bars as one polygon each.
      const a = r * 0.95;
      const w = r * 0.32;
      ctx.moveTo(x - a - w, y - a + w);
      ctx.lineTo(x - a + w, y - a - w);
      ctx.lineTo(x + a + w, y + a - w);
      ctx.lineTo(x + a - w, y + a + w);
      ctx.closePath();
      ctx.moveTo(x + a - w, y - a - w);
      ctx.lineTo(x + a + w, y - a + w);
      ctx.lineTo(x - a + w, y + a + w);
      ctx.lineTo(x - a - w, y + a - w);
      ctx.closePath();
      break;
    }
  }
}
