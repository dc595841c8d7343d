import type uPlot from 'uplot';

export interface Marker {
  x: number;
  label: string;
  color: string;
  dash?: number[];
}

export interface LevelLine {
  /** The uPlot scale the value is on. */
  scale: string;
  y: number;
  label: string;
  color: string;
  dash?: number[];
}

export interface Span {
  from: number;
  to: number;
  color: string;
}

/** A label's box on the canvas: left, top, width, height. */
type Box = [number, number, number, number];
const overlaps = (a: Box, b: Box) =>
  a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3];

/**
 * The first of `tries` (top-left corners) whose box is free of the boxes already placed, else the first
 * moved down a row at a time until free; the box chosen is added to `placed`.
 */
export function placeLabel(placed: Box[], tries: [number, number][], w: number, h: number): [number, number] {
  const free = (x: number, y: number) => !placed.some((b) => overlaps(b, [x, y, w, h]));
  let at = tries.find(([x, y]) => free(x, y));
  if (!at) {
    const [x, y0] = tries[0]!;
    let y = y0;
    for (let i = 0; i < 50 && !free(x, y); i++) y += h;
    at = [x, y];
  }
  placed.push([at[0], at[1], w, h]);
  return at;
}

/**
 * Draws shaded x spans under the series, and vertical markers and horizontal levels over them, with
 * labels placed so that none is drawn over another.
 */
export function overlays(o: { spans?: Span[]; markers?: Marker[]; levels?: LevelLine[] }): uPlot.Plugin {
  const px = (v: number) => v * devicePixelRatio;
  return {
    hooks: {
      drawClear: (u) => {
        const { ctx, bbox } = u;
        ctx.save();
        for (const s of o.spans ?? []) {
          const a = Math.max(bbox.left, u.valToPos(s.from, 'x', true));
          const b = Math.min(bbox.left + bbox.width, u.valToPos(s.to, 'x', true));
          if (b <= a) continue;
          ctx.fillStyle = s.color;
          ctx.fillRect(a, bbox.top, Math.max(b - a, px(1)), bbox.height);
        }
        ctx.restore();
      },
      draw: (u) => {
        const { ctx, bbox } = u;
        ctx.save();
        ctx.font = `${px(11)}px system-ui, sans-serif`;
        ctx.lineWidth = px(1.5);
        ctx.textBaseline = 'top';
        const h = px(13);
        const placed: Box[] = [];
        const right = bbox.left + bbox.width;
        for (const m of o.markers ?? []) {
          const x = u.valToPos(m.x, 'x', true);
          if (x < bbox.left || x > bbox.left + bbox.width) continue;
          ctx.strokeStyle = ctx.fillStyle = m.color;
          ctx.setLineDash((m.dash ?? []).map(px));
          ctx.beginPath();
          ctx.moveTo(x, bbox.top);
          ctx.lineTo(x, bbox.top + bbox.height);
          ctx.stroke();
          const w = ctx.measureText(m.label).width;
          const [lx, ly] = placeLabel(
            placed,
            [
              [x + px(3), bbox.top + px(2)],
              [x - px(3) - w, bbox.top + px(2)],
            ],
            w,
            h,
          );
          ctx.fillText(m.label, lx, ly);
        }
        for (const l of o.levels ?? []) {
          const y = u.valToPos(l.y, l.scale, true);
          if (!Number.isFinite(y) || y < bbox.top || y > bbox.top + bbox.height) continue;
          ctx.strokeStyle = ctx.fillStyle = l.color;
          ctx.setLineDash((l.dash ?? [6, 4]).map(px));
          ctx.beginPath();
          ctx.moveTo(bbox.left, y);
          ctx.lineTo(bbox.left + bbox.width, y);
          ctx.stroke();
          const w = ctx.measureText(l.label).width;
          const [lx, ly] = placeLabel(
            placed,
            [
              [bbox.left + px(4), y - px(2) - h],
              [bbox.left + px(4), y + px(2)],
              [right - px(4) - w, y - px(2) - h],
              [right - px(4) - w, y + px(2)],
            ],
            w,
            h,
          );
          ctx.fillText(l.label, lx, ly);
        }
        ctx.restore();
      },
    },
  };
}

/** [from, to] runs of x where `flag` is 1 (e.g. derate), joined across gaps no longer than one point. */
export function runs(xs: ArrayLike<number | null>, flag: ArrayLike<number | null>): [number, number][] {
  const out: [number, number][] = [];
  let start: number | null = null;
  let last: number | null = null;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    if (x === null || x === undefined) continue;
    if (flag[i] === 1) {
      start ??= x;
      last = x;
    } else if (start !== null && last !== null) {
      out.push([start, last]);
      start = last = null;
    }
  }
  if (start !== null && last !== null) out.push([start, last]);
  return out;
}
