import { roundForDisplay } from '../../core/display-rounding.ts';
import type { TrendSeries } from '../trend-series.ts';
import { dayClockText } from '../time-text.ts';

const width = 560;
const height = 150;
const pad = { left: 48, right: 96, top: 12, bottom: 26 };

/** One figure over time as inline SVG: points joined by a line, policy limits as dashed lines labelled with their value. */
export function TrendPlot({ series, timeZone, fromMs, toMs }: { series: TrendSeries; timeZone: string; fromMs: number; toMs: number }) {
  const values = [...series.points.map((p) => p.value), ...series.limits.map((l) => l.value)];
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const span = Math.max(hi - lo, 1);
  const yMin = lo - span * 0.12;
  const yMax = hi + span * 0.12;
  const spanMs = Math.max(toMs - fromMs, 1);
  const x = (t: number) => pad.left + ((t - fromMs) / spanMs) * (width - pad.left - pad.right);
  const y = (v: number) => pad.top + (1 - (v - yMin) / (yMax - yMin)) * (height - pad.top - pad.bottom);
  const path = series.points.map((p, i) => `${i === 0 ? 'M' : 'L'}${x(p.timeMs).toFixed(1)},${y(p.value).toFixed(1)}`).join(' ');
  const last = series.points.at(-1);
  const summary =
    series.points.length === 0
      ? `${series.title}: no values yet.`
      : `${series.title}: ${series.points.length} reads, from ${roundForDisplay(series.points[0]!.value)} to ${roundForDisplay(last!.value)} ${series.unit}. Limits: ${series.limits.map((l) => `${l.label} ${l.value} ${series.unit}`).join('; ')}.`;
  return (
    <figure class="trend">
      <figcaption>
        {series.title} ({series.unit})
      </figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-label={summary} preserveAspectRatio="xMidYMid meet">
        <rect x={pad.left} y={pad.top} width={width - pad.left - pad.right} height={height - pad.top - pad.bottom} class="trend-bg" />
        {series.limits.map((l) => (
          <g key={l.label}>
            <line x1={pad.left} x2={width - pad.right} y1={y(l.value)} y2={y(l.value)} class="trend-limit" />
            <text x={width - pad.right + 4} y={y(l.value) + 4} class="trend-limit-label">
              {l.value} {series.unit}
            </text>
          </g>
        ))}
        <text x={pad.left - 6} y={pad.top + 10} class="trend-axis" text-anchor="end">
          {roundForDisplay(yMax)}
        </text>
        <text x={pad.left - 6} y={height - pad.bottom} class="trend-axis" text-anchor="end">
          {roundForDisplay(yMin)}
        </text>
        <text x={pad.left} y={height - 6} class="trend-axis">
          {dayClockText(fromMs, timeZone)}
        </text>
        <text x={width - pad.right} y={height - 6} class="trend-axis" text-anchor="end">
          {dayClockText(toMs, timeZone)}
        </text>
        {path ? <path d={path} class="trend-line" /> : null}
        {series.points.map((p) => (
          <circle key={p.timeMs} cx={x(p.timeMs)} cy={y(p.value)} r={3.5} class="trend-point" />
        ))}
      </svg>
    </figure>
  );
}
