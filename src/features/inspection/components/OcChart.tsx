import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { roundTicks } from '@shared/chartTicks';
import { fixed } from '@shared/format';

const MUTED = '#5b645f';
const axisStyle = { fontSize: 11, fill: MUTED };

/**
 * The operating characteristic of the lot's plan: probability of acceptance against the lot's
 * percent defective. The x axis ends where the curve does (the plan accepts hardly any lot beyond);
 * the AQL's label sits inside the plot, clear of both axes.
 */
export function OcChart({ points, aql }: { points: { percentDefective: number; pa: number }[]; aql: number }) {
  const right = Math.max(aql, ...points.map((p) => p.percentDefective));
  const { ticks, digits: percentDigits } = roundTicks(right);
  return (
    <figure className="min-w-0 rounded border border-paper-line bg-paper-card p-2" data-testid="oc-chart">
      <figcaption className="px-1 pb-1 text-xs font-medium text-ink-muted">
        Operating characteristic: probability of acceptance against % defective in the lot
      </figcaption>
      <div className="h-56">
        <ResponsiveContainer>
          <LineChart data={points} margin={{ top: 10, right: 16, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#eceae2" />
            <XAxis
              dataKey="percentDefective"
              type="number"
              domain={[0, ticks[ticks.length - 1]]}
              ticks={ticks}
              interval={0}
              tick={axisStyle}
              tickFormatter={(v: number) => `${fixed(v, percentDigits)} %`}
              height={36}
              label={{ value: 'defective in the lot (%)', position: 'insideBottom', offset: -2, style: axisStyle }}
            />
            <YAxis
              domain={[0, 1]}
              ticks={[0, 0.25, 0.5, 0.75, 1]}
              tick={axisStyle}
              tickFormatter={(v: number) => fixed(v, 2)}
              width={56}
              label={{ value: 'P(accept)', angle: -90, position: 'insideLeft', offset: 10, style: { ...axisStyle, textAnchor: 'middle' as const } }}
            />
            <ReferenceLine
              x={aql}
              stroke="#8a5f12"
              strokeDasharray="3 3"
              label={{ value: `AQL ${aql}`, fontSize: 11, fill: '#8a5f12', position: 'insideTopLeft', offset: 8 }}
            />
            <Tooltip
              formatter={(v) => [fixed(Number(v), 3), 'Probability of acceptance']}
              labelFormatter={(v) => `${fixed(Number(v), percentDigits + 1)} % defective`}
            />
            <Line type="monotone" dataKey="pa" stroke="#234a41" dot={false} strokeWidth={2} name="Probability of acceptance" isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
