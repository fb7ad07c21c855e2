import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

/** The operating characteristic of the lot's plan: probability of acceptance against the lot's percent defective. */
export function OcChart({ points, aql }: { points: { percentDefective: number; pa: number }[]; aql: number }) {
  return (
    <figure className="rounded border border-paper-line bg-paper-card p-2" data-testid="oc-chart">
      <figcaption className="px-1 pb-1 text-xs font-medium text-ink-muted">Operating characteristic: probability of acceptance vs. % defective</figcaption>
      <div className="h-44">
        <ResponsiveContainer>
          <LineChart data={points} margin={{ top: 6, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke="#eceae2" />
            <XAxis dataKey="percentDefective" type="number" tick={{ fontSize: 11 }} tickFormatter={(v: number) => `${v}%`} />
            <YAxis domain={[0, 1]} tick={{ fontSize: 11 }} width={32} />
            <ReferenceLine
              x={aql}
              stroke="#b9821d"
              strokeDasharray="3 3"
              label={{ value: `AQL ${aql}`, fontSize: 10, fill: '#b9821d', position: 'insideTopRight' }}
            />
            <Tooltip formatter={(v) => Number(v).toFixed(3)} labelFormatter={(v) => `${v}% defective`} />
            <Line type="monotone" dataKey="pa" stroke="#234a41" dot={false} strokeWidth={2} name="Pa" />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
