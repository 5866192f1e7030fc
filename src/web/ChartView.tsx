/**
 * Draws a ChartSpec as SVG: lines, points, or bars, with interval bands (numeric x) or interval whiskers
 * (categories), axes with round ticks, axis titles and a legend. No chart library.
 */
import type { ReactNode } from 'react';
import type { ChartSeries, ChartSpec } from '../core/report/types';
import { extent, linearScale, niceTicks, tickLabel } from './chartScale';

/** Our own palette: dark enough on white for text contrast, distinguishable without colour names. */
export const SERIES_COLOURS = ['#1b5e9e', '#c0511a', '#2c7a45', '#7b4ea0', '#8a6a12', '#0f7c80'];
const MARKERS = ['circle', 'square', 'diamond', 'triangle'] as const;

const W = 640;
const H = 320;
const M = { top: 16, right: 20, bottom: 64, left: 64 };

type Geometry = {
  readonly x: (s: ChartSeries, i: number) => number | null;
  readonly ticks: readonly { at: number; label: string }[];
};

function xGeometry(chart: ChartSpec): Geometry & { readonly band: number } {
  const numeric = chart.kind !== 'bar' && chart.series.every((s) => s.x.every((v) => typeof v === 'number'));
  const left = M.left;
  const right = W - M.right;
  if (numeric) {
    const ext = extent(...chart.series.map((s) => s.x as readonly number[])) ?? [0, 1];
    // The x axis spans the data with a small margin (not out to the next round number); ticks inside it only.
    const pad = (ext[1] - ext[0]) * 0.03 || 1;
    const lo = ext[0] - pad;
    const hi = ext[1] + pad;
    const ticks = niceTicks(ext[0], ext[1], 6).filter((t) => t >= lo && t <= hi);
    const sx = linearScale(lo, hi, left, right);
    return {
      band: 0,
      x: (s, i) => {
        const v = s.x[i];
        return typeof v === 'number' && Number.isFinite(v) ? sx(v) : null;
      },
      ticks: ticks.map((t) => ({ at: sx(t), label: tickLabel(t) })),
    };
  }
  const categories: string[] = [];
  for (const s of chart.series) for (const v of s.x) if (!categories.includes(String(v))) categories.push(String(v));
  const band = (right - left) / Math.max(1, categories.length);
  const centre = (c: string): number => left + (categories.indexOf(c) + 0.5) * band;
  return {
    band,
    x: (s, i) => (s.x[i] === undefined ? null : centre(String(s.x[i]))),
    ticks: categories.map((c) => ({ at: centre(c), label: c })),
  };
}

function marker(shape: (typeof MARKERS)[number], x: number, y: number, colour: string, key: string): ReactNode {
  const r = 4;
  if (shape === 'circle') return <circle key={key} cx={x} cy={y} r={r} fill={colour} />;
  if (shape === 'square') return <rect key={key} x={x - r} y={y - r} width={2 * r} height={2 * r} fill={colour} />;
  if (shape === 'diamond')
    return (
      <polygon
        key={key}
        points={`${x},${y - r - 1} ${x + r + 1},${y} ${x},${y + r + 1} ${x - r - 1},${y}`}
        fill={colour}
      />
    );
  return <polygon key={key} points={`${x},${y - r - 1} ${x + r + 1},${y + r} ${x - r - 1},${y + r}`} fill={colour} />;
}

/** Splits a series into runs of consecutive drawable points (a null y breaks the line). */
function runs(points: readonly ({ x: number; y: number } | null)[]): { x: number; y: number }[][] {
  const out: { x: number; y: number }[][] = [];
  let cur: { x: number; y: number }[] = [];
  for (const p of points) {
    if (p === null) {
      if (cur.length > 0) out.push(cur);
      cur = [];
    } else cur.push(p);
  }
  if (cur.length > 0) out.push(cur);
  return out;
}

/** The colour group of a series: the part of its name before ": " ("Active: model" and "Active: observed mean" share
 * a colour), else the whole name. */
export function colourGroup(name: string): string {
  const at = name.indexOf(': ');
  return at > 0 ? name.slice(0, at) : name;
}

export interface ChartViewProps {
  readonly chart: ChartSpec;
  /** 'percent' writes y ticks as percentages (for rates stored as fractions). */
  readonly yAxis?: 'plain' | 'percent';
}

/** The legend's sentence about intervals, naming only what the chart drew (regression: it spoke of shaded bands on
 * charts that had whiskers only); null when it drew neither. */
export function intervalLegend(bands: boolean, whiskers: boolean): string | null {
  const what = bands && whiskers ? 'Shaded bands and whiskers show' : bands ? 'Shaded bands show' : whiskers ? 'Whiskers show' : null;
  return what === null ? null : `${what} the interval or range described with the table above.`;
}

export function ChartView({ chart, yAxis = 'plain' }: ChartViewProps): ReactNode {
  const geo = xGeometry(chart);
  const groups = [...new Set(chart.series.map((s) => colourGroup(s.name)))];
  const yTickLabel = (t: number): string =>
    yAxis === 'percent' ? `${tickLabel(Math.round(t * 1000) / 10)}%` : tickLabel(t);
  const yExt = extent(...chart.series.flatMap((s) => [s.y, s.lower, s.upper])) ?? [0, 1];
  const yLo = chart.kind === 'bar' ? Math.min(0, yExt[0]) : yExt[0];
  const yHi = chart.kind === 'bar' ? Math.max(0, yExt[1]) : yExt[1];
  const yTicks = niceTicks(yLo, yHi, 5);
  const y0 = yTicks[0] ?? yLo;
  const y1 = yTicks[yTicks.length - 1] ?? yHi;
  const sy = linearScale(y0, y1, H - M.bottom, M.top);
  const fin = (v: number | null | undefined): v is number => v !== null && v !== undefined && Number.isFinite(v);
  const nSeries = chart.series.length;
  const barWidth = (geo.band * 0.8) / Math.max(1, nSeries);
  const longLabels = geo.ticks.length > 6 || geo.ticks.some((t) => t.label.length > 8);

  const drawn = chart.series.map((s, k) => {
    const colour = SERIES_COLOURS[groups.indexOf(colourGroup(s.name)) % SERIES_COLOURS.length] ?? '#333';
    const shape = MARKERS[k % MARKERS.length] ?? 'circle';
    const parts: ReactNode[] = [];
    const xs = s.y.map((_, i) => {
      const x = geo.x(s, i);
      if (x === null) return null;
      return chart.kind === 'bar' ? x - (geo.band * 0.8) / 2 + (k + 0.5) * barWidth : x;
    });
    const lineStyle = chart.kind !== 'bar' && (s.style === 'line' || (s.style === undefined && chart.kind === 'line'));
    const intervals = s.lower !== undefined && s.upper !== undefined;
    let band = false;
    let whiskers = false;
    if (intervals && lineStyle && geo.band === 0) {
      const top: string[] = [];
      const bottom: string[] = [];
      s.y.forEach((_, i) => {
        const x = xs[i];
        const lo = s.lower?.[i];
        const hi = s.upper?.[i];
        if (x !== null && x !== undefined && fin(lo) && fin(hi)) {
          top.push(`${x},${sy(hi)}`);
          bottom.unshift(`${x},${sy(lo)}`);
        }
      });
      if (top.length > 1) {
        parts.push(<polygon key="band" points={[...top, ...bottom].join(' ')} fill={colour} opacity={0.15} />);
        band = true;
      }
    } else if (intervals) {
      s.y.forEach((_, i) => {
        const x = xs[i];
        const lo = s.lower?.[i];
        const hi = s.upper?.[i];
        if (x === null || x === undefined || !fin(lo) || !fin(hi)) return;
        whiskers = true;
        parts.push(
          <g key={`w${i}`} stroke={colour} strokeWidth={1.5}>
            <line x1={x} x2={x} y1={sy(lo)} y2={sy(hi)} />
            <line x1={x - 4} x2={x + 4} y1={sy(lo)} y2={sy(lo)} />
            <line x1={x - 4} x2={x + 4} y1={sy(hi)} y2={sy(hi)} />
          </g>,
        );
      });
    }
    if (chart.kind === 'bar') {
      s.y.forEach((v, i) => {
        const x = xs[i];
        if (x === null || x === undefined || !fin(v)) return;
        const top = sy(Math.max(0, v));
        const height = Math.abs(sy(0) - sy(v));
        parts.unshift(
          <rect
            key={`b${i}`}
            x={x - barWidth / 2 + 1}
            y={top}
            width={Math.max(1, barWidth - 2)}
            height={height}
            fill={colour}
            opacity={0.85}
          />,
        );
      });
    } else {
      const pts = s.y.map((v, i) => {
        const x = xs[i];
        return x !== null && x !== undefined && fin(v) ? { x, y: sy(v) } : null;
      });
      if (lineStyle) {
        runs(pts).forEach((run, r) =>
          parts.push(
            <polyline
              key={`l${r}`}
              points={run.map((p) => `${p.x},${p.y}`).join(' ')}
              fill="none"
              stroke={colour}
              strokeWidth={2}
            />,
          ),
        );
      }
      // A line through many points reads better without a marker on each.
      const showMarkers = !lineStyle || pts.length <= 12;
      pts.forEach((p, i) => {
        if (p && showMarkers) parts.push(marker(shape, p.x, p.y, colour, `m${i}`));
      });
    }
    return { name: s.name, colour, shape, line: lineStyle, band, whiskers, node: <g key={k}>{parts}</g> };
  });
  const intervalNote = intervalLegend(
    drawn.some((d) => d.band),
    drawn.some((d) => d.whiskers),
  );

  const description = `${chart.title}. ${chart.yLabel} against ${chart.xLabel}; series: ${chart.series.map((s) => s.name).join(', ')}.`;
  return (
    <figure className="chart">
      <figcaption className="chart-title">{chart.title}</figcaption>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        width="100%"
        role="img"
        aria-label={description}
        style={{ maxWidth: `${W}px`, display: 'block' }}
      >
        {yTicks.map((t) => (
          <g key={`y${t}`}>
            <line
              x1={M.left}
              x2={W - M.right}
              y1={sy(t)}
              y2={sy(t)}
              stroke={t === 0 ? '#777' : '#e3e3e3'}
              strokeWidth={t === 0 ? 1.2 : 1}
            />
            <text x={M.left - 6} y={sy(t)} textAnchor="end" dominantBaseline="middle" fontSize={11} fill="#333">
              {yTickLabel(t)}
            </text>
          </g>
        ))}
        <line x1={M.left} x2={W - M.right} y1={H - M.bottom} y2={H - M.bottom} stroke="#555" />
        <line x1={M.left} x2={M.left} y1={M.top} y2={H - M.bottom} stroke="#555" />
        {geo.ticks.map((t, i) => (
          <g key={`x${i}`}>
            <line x1={t.at} x2={t.at} y1={H - M.bottom} y2={H - M.bottom + 4} stroke="#555" />
            <text
              x={t.at}
              y={H - M.bottom + 16}
              fontSize={11}
              fill="#333"
              textAnchor={longLabels ? 'end' : 'middle'}
              transform={longLabels ? `rotate(-30 ${t.at} ${H - M.bottom + 16})` : undefined}
            >
              {t.label}
            </text>
          </g>
        ))}
        {drawn.map((d) => d.node)}
        <text x={(M.left + W - M.right) / 2} y={H - 6} textAnchor="middle" fontSize={12} fill="#222">
          {chart.xLabel}
        </text>
        <text
          x={14}
          y={(M.top + H - M.bottom) / 2}
          textAnchor="middle"
          fontSize={12}
          fill="#222"
          transform={`rotate(-90 14 ${(M.top + H - M.bottom) / 2})`}
        >
          {chart.yLabel}
        </text>
      </svg>
      {drawn.length > 1 || intervalNote !== null ? (
        <ul className="chart-legend" aria-label="Legend">
          {drawn.map((d) => (
            <li key={d.name}>
              <svg width="22" height="14" aria-hidden="true">
                {d.line ? (
                  <line x1={1} x2={21} y1={7} y2={7} stroke={d.colour} strokeWidth={2.5} />
                ) : (
                  marker(d.shape, 11, 7, d.colour, 'k')
                )}
              </svg>
              {d.name}
            </li>
          ))}
          {intervalNote !== null && <li className="chart-legend-note">{intervalNote}</li>}
        </ul>
      ) : null}
    </figure>
  );
}
