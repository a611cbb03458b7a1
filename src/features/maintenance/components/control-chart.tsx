import type { IndividualsChart } from '@shared/requalification';

// An individuals control chart (NIST/SEMATECH e-Handbook §6.3.2.2): the points in order,
// the centre line and the ±3σ limits from the mean moving range. A point beyond the limits
// is drawn as a larger filled diamond and listed in words, so colour is never the only cue.

interface Props {
  label: string;
  unit: string;
  points: { at: string; value: number }[];
  chart: IndividualsChart;
}

const W = 560;
const H = 180;
const PAD = { l: 56, r: 12, t: 12, b: 24 };

export function ControlChart({ label, unit, points, chart }: Props) {
  const values = points.map((p) => p.value);
  const lines = [chart.center, chart.ucl, chart.lcl].filter((v): v is number => v !== null);
  let lo = Math.min(...values, ...lines);
  let hi = Math.max(...values, ...lines);
  if (hi === lo) {
    hi += 1;
    lo -= 1;
  }
  const x = (i: number) => PAD.l + (points.length === 1 ? (W - PAD.l - PAD.r) / 2 : (i * (W - PAD.l - PAD.r)) / (points.length - 1));
  const y = (v: number) => PAD.t + ((hi - v) * (H - PAD.t - PAD.b)) / (hi - lo);
  const fmt = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(1) : v.toFixed(3));
  const beyond = new Set(chart.beyond);
  return (
    <figure className="flex flex-col gap-1">
      <figcaption className="text-sm font-semibold text-ink">
        {label} {unit && <span className="font-normal text-muted">({unit})</span>}
      </figcaption>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={`Individuals chart of ${label}: ${points.length} records, centre ${fmt(chart.center)}${chart.ucl !== null ? `, limits ${fmt(chart.lcl!)} to ${fmt(chart.ucl)}` : ''}`}
        className="w-full max-w-xl"
      >
        {[
          { v: chart.ucl, name: 'UCL', dash: '6 4' },
          { v: chart.center, name: 'CL', dash: '' },
          { v: chart.lcl, name: 'LCL', dash: '6 4' },
        ].map(
          (l) =>
            l.v !== null && (
              <g key={l.name}>
                <line
                  x1={PAD.l}
                  x2={W - PAD.r}
                  y1={y(l.v)}
                  y2={y(l.v)}
                  stroke="currentColor"
                  strokeDasharray={l.dash}
                  className="text-muted"
                />
                <text x={PAD.l - 4} y={y(l.v) + 4} textAnchor="end" fontSize="11" fill="currentColor" className="text-muted">
                  {l.name} {fmt(l.v)}
                </text>
              </g>
            ),
        )}
        <polyline
          fill="none"
          stroke="currentColor"
          strokeWidth="1.5"
          className="text-accent"
          points={points.map((p, i) => `${x(i)},${y(p.value)}`).join(' ')}
        />
        {points.map((p, i) =>
          beyond.has(i) ? (
            <path key={i} d={`M ${x(i)} ${y(p.value) - 7} l 7 7 l -7 7 l -7 -7 z`} fill="currentColor" className="text-alert-danger-ink">
              <title>{`Beyond the limits: ${fmt(p.value)} on ${new Date(p.at).toLocaleDateString()}`}</title>
            </path>
          ) : (
            <circle key={i} cx={x(i)} cy={y(p.value)} r="3.5" fill="currentColor" className="text-accent">
              <title>{`${fmt(p.value)} on ${new Date(p.at).toLocaleDateString()}`}</title>
            </circle>
          ),
        )}
      </svg>
      {chart.beyond.length > 0 && (
        <p className="text-sm font-medium text-alert-danger-ink">
          ◆ {chart.beyond.length === 1 ? 'One record lies' : `${chart.beyond.length} records lie`} beyond the control limits.
        </p>
      )}
      {chart.ucl === null && <p className="text-xs text-muted">Limits appear from the second record on.</p>}
    </figure>
  );
}
