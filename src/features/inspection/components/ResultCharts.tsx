// The lot drawn: retardance errors and axis errors of the measured pieces against their tolerance
// bands, and every piece as a point in the tolerance box.
import { CartesianGrid, ReferenceArea, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis, ZAxis } from 'recharts';
import type { LotInspectionView } from '@shared/schemas/inspection';

const PASS = '#2e7d4f';
const FAIL = '#b3372f';
const BAND = '#234a41';

type Point = { index: number; serial: string; retardanceError: number; axisError: number; verdict: string };

function pointsOf(view: LotInspectionView): Point[] {
  const points: Point[] = [];
  view.pieces.forEach((piece) => {
    for (const r of piece.results) {
      if (!r.judged || r.retardanceErrorWaves === null || r.axisErrorDeg === null) continue;
      points.push({ index: points.length + 1, serial: piece.serial, retardanceError: r.retardanceErrorWaves, axisError: r.axisErrorDeg, verdict: r.verdict });
    }
  });
  return points;
}

function Panel({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <figure className="rounded border border-paper-line bg-paper-card p-2">
      <figcaption className="px-1 pb-1 text-xs font-medium text-ink-muted">{title}</figcaption>
      <div className="h-56">{children}</div>
    </figure>
  );
}

const axisStyle = { fontSize: 11, fill: '#5b645f' };
const tooltip = <Tooltip formatter={(value) => Number(value).toFixed(4)} labelFormatter={() => ''} />;

type ByPieceProps = { title: string; field: 'retardanceError' | 'axisError'; limit: number; span: number; digits: number; pass: Point[]; fail: Point[] };

/** One error per measured piece against its ± tolerance band. */
function ByPieceChart({ title, field, limit, span, digits, pass, fail }: ByPieceProps) {
  return (
    <Panel title={title}>
      <ResponsiveContainer>
        <ScatterChart margin={{ top: 8, right: 12, bottom: 4, left: 4 }}>
          <CartesianGrid stroke="#eceae2" />
          <XAxis dataKey="index" type="number" name="piece" tick={axisStyle} allowDecimals={false} />
          <YAxis
            dataKey={field}
            type="number"
            name={field}
            domain={[-span, span]}
            tick={axisStyle}
            tickFormatter={(v: number) => v.toFixed(digits)}
            width={52}
          />
          <ReferenceArea y1={-limit} y2={limit} fill={BAND} fillOpacity={0.08} stroke={BAND} strokeOpacity={0.4} />
          {tooltip}
          <Scatter data={pass} fill={PASS} name="pass" />
          <Scatter data={fail} fill={FAIL} name="fail" shape="diamond" />
        </ScatterChart>
      </ResponsiveContainer>
    </Panel>
  );
}

export function ResultCharts({ view }: { view: LotInspectionView }) {
  const points = pointsOf(view);
  if (points.length === 0) return null;
  const tol = view.spec.retardanceTolWaves;
  const axisTol = view.spec.axisTolDeg;
  const pass = points.filter((p) => p.verdict === 'pass');
  const fail = points.filter((p) => p.verdict !== 'pass');
  const span = (values: number[], limit: number) => Math.max(limit * 1.6, ...values.map((v) => Math.abs(v) * 1.15));
  const rSpan = span(
    points.map((p) => p.retardanceError),
    tol,
  );
  const aSpan = span(
    points.map((p) => p.axisError),
    axisTol,
  );
  return (
    <div className="grid gap-3 lg:grid-cols-3" data-testid="result-charts">
      <ByPieceChart
        title={`Retardance error (λ) by piece, tolerance ±${tol} λ`}
        field="retardanceError"
        limit={tol}
        span={rSpan}
        digits={3}
        pass={pass}
        fail={fail}
      />
      <ByPieceChart
        title={`Fast-axis error (°) by piece, tolerance ±${axisTol}°`}
        field="axisError"
        limit={axisTol}
        span={aSpan}
        digits={2}
        pass={pass}
        fail={fail}
      />
      <Panel title="Tolerance box: retardance error (λ) × axis error (°)">
        <ResponsiveContainer>
          <ScatterChart margin={{ top: 8, right: 12, bottom: 4, left: 4 }}>
            <CartesianGrid stroke="#eceae2" />
            <XAxis
              dataKey="retardanceError"
              type="number"
              name="error λ"
              domain={[-rSpan, rSpan]}
              tick={axisStyle}
              tickFormatter={(v: number) => v.toFixed(3)}
            />
            <YAxis
              dataKey="axisError"
              type="number"
              name="axis °"
              domain={[-aSpan, aSpan]}
              tick={axisStyle}
              tickFormatter={(v: number) => v.toFixed(2)}
              width={44}
            />
            <ZAxis range={[36, 36]} />
            <ReferenceArea x1={-tol} x2={tol} y1={-axisTol} y2={axisTol} fill={BAND} fillOpacity={0.08} stroke={BAND} strokeOpacity={0.5} />
            {tooltip}
            <Scatter data={pass} fill={PASS} />
            <Scatter data={fail} fill={FAIL} shape="diamond" />
          </ScatterChart>
        </ResponsiveContainer>
      </Panel>
    </div>
  );
}
