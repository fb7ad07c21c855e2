// The lot drawn: retardance errors and axis errors of the measured pieces against their tolerance
// bands, along the measuring order or by serial, and every piece as a point in the tolerance box.
// Ticks sit at 0 and the tolerance limits; tooltips name the serial and write values as the table does.
import { useState } from 'react';
import { CartesianGrid, ReferenceArea, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis, ZAxis, type TooltipContentProps } from 'recharts';
import { digitsOf, positionTicks, symmetricExtent, tickText, toleranceTicks } from '@shared/chartTicks';
import { fixed, signedFixed } from '@shared/format';
import type { LotInspectionView } from '@shared/schemas/inspection';

const PASS = '#2e7d4f';
const FAIL = '#b3372f';
const BAND = '#234a41';
const MUTED = '#5b645f';

type Point = { index: number; serial: string; wavelengthNm: number; retardanceError: number; axisError: number; verdict: string };
type Order = 'measured' | 'serial';

function pointsOf(view: LotInspectionView): Point[] {
  const points: Point[] = [];
  view.pieces.forEach((piece) => {
    for (const r of piece.results) {
      if (!r.judged || r.retardanceErrorWaves === null || r.axisErrorDeg === null) continue;
      points.push({
        index: points.length + 1,
        serial: piece.serial,
        wavelengthNm: r.wavelengthNm,
        retardanceError: r.retardanceErrorWaves,
        axisError: r.axisErrorDeg,
        verdict: r.verdict,
      });
    }
  });
  return points;
}

function Panel({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <figure className="min-w-0 rounded border border-paper-line bg-paper-card p-2">
      <figcaption className="px-1 pb-1 text-xs font-medium text-ink-muted">{title}</figcaption>
      <div className="h-60">{children}</div>
    </figure>
  );
}

const axisStyle = { fontSize: 11, fill: MUTED };

/** The piece under the pointer as the results table writes it: serial, wavelength, both errors, verdict. */
function PieceTooltip({ active, payload }: TooltipContentProps<number, string>) {
  if (!active || !payload?.length) return null;
  const p = payload[0].payload as Point;
  return (
    <div className="rounded border border-paper-line bg-paper-card px-2 py-1.5 text-xs shadow-sm" data-testid="chart-tooltip">
      <p className="font-mono font-semibold">{p.serial}</p>
      <p className="text-ink-muted">at {fixed(p.wavelengthNm, 1)} nm</p>
      <p>Retardance error {signedFixed(p.retardanceError, 4)} λ</p>
      <p>Axis error {signedFixed(p.axisError, 2)}°</p>
      <p className={p.verdict === 'pass' ? 'text-state-pass' : 'text-state-fail'}>{p.verdict === 'pass' ? 'Pass' : 'Fail'}</p>
    </div>
  );
}
const tooltip = <Tooltip content={(props) => <PieceTooltip {...(props as TooltipContentProps<number, string>)} />} />;

type Scale = { limit: number; extent: number; ticks: number[]; digits: number; unit: string };

function scaleOf(values: number[], limit: number, unit: string): Scale {
  const extent = symmetricExtent(values, limit);
  return { limit, extent, ticks: toleranceTicks(limit, extent), digits: digitsOf(limit), unit };
}

const unitLabel = (value: string, angle = 0) =>
  angle
    ? { value, angle, position: 'insideLeft' as const, offset: 10, style: { ...axisStyle, textAnchor: 'middle' as const } }
    : { value, position: 'insideBottom' as const, offset: -2, style: axisStyle };

type ByPieceProps = { title: string; field: 'retardanceError' | 'axisError'; scale: Scale; order: Order; points: Point[] };

const bySerial = (a: string, b: string) => a.localeCompare(b, 'en', { numeric: true });

/** One error per measured result against its ± tolerance band, along the measuring order or by serial. */
function ByPieceChart({ title, field, scale, order, points }: ByPieceProps) {
  // By serial, each serial has its place (several wavelengths of a piece share it) and the ticks name serials.
  const serials = [...new Set(points.map((p) => p.serial))].sort(bySerial);
  const place = new Map(serials.map((serial, i) => [serial, i + 1]));
  const data = order === 'serial' ? points.map((p) => ({ ...p, x: place.get(p.serial)! })) : points.map((p) => ({ ...p, x: p.index }));
  const count = order === 'serial' ? serials.length : points.length;
  const pass = data.filter((p) => p.verdict === 'pass');
  const fail = data.filter((p) => p.verdict !== 'pass');
  return (
    <Panel title={title}>
      <ResponsiveContainer>
        <ScatterChart margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
          <CartesianGrid stroke="#eceae2" />
          <XAxis
            dataKey="x"
            type="number"
            domain={[0.5, count + 0.5]}
            ticks={positionTicks(count)}
            interval={order === 'serial' ? 'preserveStartEnd' : 0}
            tick={axisStyle}
            tickFormatter={(x: number) => (order === 'serial' ? (serials[x - 1] ?? '') : String(x))}
            height={36}
            label={unitLabel(order === 'serial' ? 'serial' : 'measured, in order')}
          />
          <YAxis
            dataKey={field}
            type="number"
            domain={[-scale.extent, scale.extent]}
            ticks={scale.ticks}
            interval={0}
            tick={axisStyle}
            tickFormatter={(v: number) => tickText(v, scale.digits)}
            width={64}
            allowDataOverflow
            label={unitLabel(`error (${scale.unit})`, -90)}
          />
          <ReferenceArea y1={-scale.limit} y2={scale.limit} fill={BAND} fillOpacity={0.08} stroke={BAND} strokeOpacity={0.4} />
          <ZAxis range={[36, 36]} />
          {tooltip}
          <Scatter data={pass} fill={PASS} name="pass" isAnimationActive={false} />
          <Scatter data={fail} fill={FAIL} name="fail" shape="diamond" isAnimationActive={false} />
        </ScatterChart>
      </ResponsiveContainer>
    </Panel>
  );
}

export function ResultCharts({ view }: { view: LotInspectionView }) {
  const [order, setOrder] = useState<Order>('measured');
  const points = pointsOf(view);
  if (points.length === 0) return null;
  const retardance = scaleOf(
    points.map((p) => p.retardanceError),
    view.spec.retardanceTolWaves,
    'λ',
  );
  const axis = scaleOf(
    points.map((p) => p.axisError),
    view.spec.axisTolDeg,
    '°',
  );
  const pass = points.filter((p) => p.verdict === 'pass');
  const fail = points.filter((p) => p.verdict !== 'pass');
  return (
    <section className="space-y-2" aria-label="Result charts">
      <fieldset className="flex flex-wrap items-center gap-3 text-xs text-ink-muted">
        <legend className="sr-only">Order of the pieces along the charts</legend>
        <span>Pieces along the x axis:</span>
        {(
          [
            ['measured', 'in measuring order'],
            ['serial', 'by serial'],
          ] as const
        ).map(([value, label]) => (
          <label key={value} className="inline-flex items-center gap-1">
            <input type="radio" name="chart-order" value={value} checked={order === value} onChange={() => setOrder(value)} /> {label}
          </label>
        ))}
      </fieldset>
      <div className="grid gap-3 lg:grid-cols-3" data-testid="result-charts">
        <ByPieceChart
          title={`Retardance error (λ), tolerance ±${tickText(retardance.limit, retardance.digits)} λ`}
          field="retardanceError"
          scale={retardance}
          order={order}
          points={points}
        />
        <ByPieceChart
          title={`Fast-axis error (°), tolerance ±${tickText(axis.limit, axis.digits)}°`}
          field="axisError"
          scale={axis}
          order={order}
          points={points}
        />
        <Panel title="Tolerance box: retardance error (λ) × axis error (°)">
          <ResponsiveContainer>
            <ScatterChart margin={{ top: 8, right: 12, bottom: 8, left: 8 }}>
              <CartesianGrid stroke="#eceae2" />
              <XAxis
                dataKey="retardanceError"
                type="number"
                domain={[-retardance.extent, retardance.extent]}
                ticks={retardance.ticks}
                interval={0}
                tick={axisStyle}
                tickFormatter={(v: number) => tickText(v, retardance.digits)}
                height={36}
                allowDataOverflow
                label={unitLabel('retardance error (λ)')}
              />
              <YAxis
                dataKey="axisError"
                type="number"
                domain={[-axis.extent, axis.extent]}
                ticks={axis.ticks}
                interval={0}
                tick={axisStyle}
                tickFormatter={(v: number) => tickText(v, axis.digits)}
                width={64}
                allowDataOverflow
                label={unitLabel('axis error (°)', -90)}
              />
              <ZAxis range={[36, 36]} />
              <ReferenceArea
                x1={-retardance.limit}
                x2={retardance.limit}
                y1={-axis.limit}
                y2={axis.limit}
                fill={BAND}
                fillOpacity={0.08}
                stroke={BAND}
                strokeOpacity={0.5}
              />
              {tooltip}
              <Scatter data={pass} fill={PASS} isAnimationActive={false} />
              <Scatter data={fail} fill={FAIL} shape="diamond" isAnimationActive={false} />
            </ScatterChart>
          </ResponsiveContainer>
        </Panel>
      </div>
    </section>
  );
}
