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

/** Draws shaded x spans under the series, and vertical markers and horizontal levels over them, with labels. */
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
        for (const m of o.markers ?? []) {
          const x = u.valToPos(m.x, 'x', true);
          if (x < bbox.left || x > bbox.left + bbox.width) continue;
          ctx.strokeStyle = ctx.fillStyle = m.color;
          ctx.setLineDash((m.dash ?? []).map(px));
          ctx.beginPath();
          ctx.moveTo(x, bbox.top);
          ctx.lineTo(x, bbox.top + bbox.height);
          ctx.stroke();
          ctx.fillText(m.label, x + px(3), bbox.top + px(12));
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
          ctx.fillText(l.label, bbox.left + px(4), y - px(4));
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
