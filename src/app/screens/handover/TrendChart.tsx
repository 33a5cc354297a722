import { roundForDisplay } from '../../../core/display-rounding.ts';
import { qtcFormulaShortNames } from '../../../core/qtc.ts';
import type { ThresholdLine, TrendSeries } from '../../../core/trend.ts';
import { clockText, dayClockText } from '../../time-text.ts';

/** Chart sizes: small on a desk card, full on a bed's handover, and half a sheet wide on paper. */
export type TrendChartSize = 'mini' | 'full' | 'print';

const sizes = {
  mini: { width: 320, height: 92, pad: { left: 30, right: 34, top: 6, bottom: 16 }, font: 11, pointR: 3 },
  full: { width: 640, height: 170, pad: { left: 44, right: 140, top: 10, bottom: 24 }, font: 12, pointR: 3.6 },
  print: { width: 420, height: 170, pad: { left: 34, right: 112, top: 8, bottom: 20 }, font: 12, pointR: 3.4 },
} as const;

/** Short names for limit lines, so labels fit beside the plot. */
const limitNames: Record<ThresholdLine['key'], string> = {
  rateLowBpm: 'low',
  rateHighBpm: 'high',
  prShortMs: 'short',
  prLongMs: 'long',
  prMarkedMs: 'marked',
  qrsWideMs: 'wide',
  qtcProlongedMaleMs: 'prolonged',
  qtcProlongedFemaleMs: 'prolonged',
  qtcShortMs: 'short',
  qtcHighRiskMs: 'high risk',
  qtcRiseMs: 'rise limit',
  baselineQtc: 'baseline',
};

const comparatorWords: Record<ThresholdLine['comparator'], string> = { '<': 'below', '>': 'above', '>=': 'at or above', '<=': 'at or below' };

/** Limit lines a chart draws: the severity-bearing ones and the baseline; a mini chart keeps the nearest three. */
function linesToDraw(series: TrendSeries, size: TrendChartSize): ThresholdLine[] {
  if (size !== 'mini' || series.thresholds.length <= 3) return series.thresholds;
  const values = series.points.map((p) => p.value);
  const centre = values.length > 0 ? values.reduce((a, b) => a + b, 0) / values.length : (series.thresholds[0]?.value ?? 0);
  return [...series.thresholds].sort((a, b) => Math.abs(a.value - centre) - Math.abs(b.value - centre)).slice(0, 3);
}

/** 'Tue 19:00' in the unit's zone: a 24 h axis from 19:00 to 19:00 needs the day to be read. */
const weekdayFormats = new Map<string, Intl.DateTimeFormat>();
function weekdayClockText(epochMs: number, timeZone: string): string {
  let format = weekdayFormats.get(timeZone);
  if (!format) {
    format = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    weekdayFormats.set(timeZone, format);
  }
  return format.format(new Date(epochMs));
}

/** Label heights moved apart just enough not to overlap, keeping their order (limits 10 ms apart would otherwise print on top of each other). */
function spreadLabels(ys: readonly number[], gap: number): number[] {
  const order = ys.map((value, index) => ({ value, index })).sort((a, b) => a.value - b.value);
  const placed = new Array<number>(ys.length);
  let previous = Number.NEGATIVE_INFINITY;
  for (const { value, index } of order) {
    const at = Math.max(value, previous + gap);
    placed[index] = at;
    previous = at;
  }
  return placed;
}

/**
 * One figure across a time window as inline SVG (no script, prints as drawn): the unit's limit lines
 * dashed and labelled, the shift shaded, a point per read, flagged reads drawn as open diamonds
 * (shape, not colour alone), and a "now" line when now falls in the window.
 */
export function TrendChart(props: { series: TrendSeries; fromMs: number; toMs: number; timeZone: string; size: TrendChartSize; shift?: { startMs: number; endMs: number }; nowMs?: number }) {
  const { series, fromMs, toMs, timeZone, size, shift, nowMs } = props;
  const { width, height, pad, font, pointR } = sizes[size];
  const lines = linesToDraw(series, size);
  const values = [...series.points.map((p) => p.value), ...lines.map((l) => l.value)];
  const lo = values.length > 0 ? Math.min(...values) : 0;
  const hi = values.length > 0 ? Math.max(...values) : 1;
  const span = Math.max(hi - lo, 10);
  const yMin = lo - span * 0.1;
  const yMax = hi + span * 0.1;
  const spanMs = Math.max(toMs - fromMs, 1);
  const plotRight = width - pad.right;
  const x = (t: number) => pad.left + ((t - fromMs) / spanMs) * (plotRight - pad.left);
  const y = (v: number) => pad.top + (1 - (v - yMin) / (yMax - yMin)) * (height - pad.top - pad.bottom);
  const path = series.points.map((p, i) => `${i === 0 ? 'M' : 'L'}${x(p.stripTimeMs).toFixed(1)},${y(p.value).toFixed(1)}`).join(' ');
  const title = series.formula ? `QTc by ${qtcFormulaShortNames[series.formula]}` : series.label;
  const pointsText =
    series.points.length === 0
      ? 'no reads in this window'
      : `${series.points.length} ${series.points.length === 1 ? 'read' : 'reads'}: ${series.points.map((p) => `${clockText(p.stripTimeMs, timeZone)} ${roundForDisplay(p.value)}${p.flagged ? ' (flagged)' : ''}`).join(', ')}`;
  const limitsText = lines.map((l) => `${l.label} ${comparatorWords[l.comparator]} ${roundForDisplay(l.value)} ${series.unit}`).join('; ');
  const summary = `${title}, ${series.unit}, ${dayClockText(fromMs, timeZone)} to ${dayClockText(toMs, timeZone)}: ${pointsText}. Limits: ${limitsText || 'none'}.`;
  const nowInWindow = nowMs !== undefined && nowMs > fromMs && nowMs < toMs;
  const labelY = spreadLabels(lines.map((l) => y(l.value)), font + 1);
  return (
    <figure class={`trend-chart trend-chart-${size}`}>
      <figcaption>
        {title} ({series.unit})
      </figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-label={summary} preserveAspectRatio="xMidYMid meet">
        <rect x={pad.left} y={pad.top} width={plotRight - pad.left} height={height - pad.top - pad.bottom} class="tc-bg" />
        {shift ? (
          <rect x={x(Math.max(shift.startMs, fromMs))} y={pad.top} width={Math.max(0, x(Math.min(shift.endMs, toMs)) - x(Math.max(shift.startMs, fromMs)))} height={height - pad.top - pad.bottom} class="tc-shift" />
        ) : null}
        {lines.map((l, i) => (
          <g key={`${l.key}-${l.value}`}>
            <line x1={pad.left} x2={plotRight} y1={y(l.value)} y2={y(l.value)} class={`tc-limit tc-limit-${l.severity ?? 'baseline'}`} />
            <text x={plotRight + 4} y={(labelY[i] ?? y(l.value)) + font / 3} class="tc-limit-label">
              {size === 'mini' ? roundForDisplay(l.value) : `${roundForDisplay(l.value)} ${limitNames[l.key]}`}
            </text>
          </g>
        ))}
        <text x={pad.left - 4} y={pad.top + font} text-anchor="end" class="tc-axis">
          {roundForDisplay(yMax)}
        </text>
        <text x={pad.left - 4} y={height - pad.bottom} text-anchor="end" class="tc-axis">
          {roundForDisplay(yMin)}
        </text>
        <text x={pad.left} y={height - 4} class="tc-axis">
          {size === 'mini' ? weekdayClockText(fromMs, timeZone) : dayClockText(fromMs, timeZone)}
        </text>
        <text x={plotRight} y={height - 4} text-anchor="end" class="tc-axis">
          {size === 'mini' ? weekdayClockText(toMs, timeZone) : dayClockText(toMs, timeZone)}
        </text>
        {nowInWindow ? <line x1={x(nowMs)} x2={x(nowMs)} y1={pad.top} y2={height - pad.bottom} class="tc-now" /> : null}
        {path ? <path d={path} class="tc-line" /> : null}
        {series.points.map((p) =>
          p.flagged ? (
            <path key={p.readId} d={`M${x(p.stripTimeMs)},${y(p.value) - pointR * 1.6} l${pointR * 1.6},${pointR * 1.6} l${-pointR * 1.6},${pointR * 1.6} l${-pointR * 1.6},${-pointR * 1.6} Z`} class="tc-point-flagged" />
          ) : (
            <circle key={p.readId} cx={x(p.stripTimeMs)} cy={y(p.value)} r={pointR} class="tc-point" />
          ),
        )}
        {series.points.length === 0 ? (
          <text x={(pad.left + plotRight) / 2} y={(pad.top + height - pad.bottom) / 2} text-anchor="middle" class="tc-empty">
            No reads in this window
          </text>
        ) : null}
      </svg>
    </figure>
  );
}
