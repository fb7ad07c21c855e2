// One characteristic of a supplier's part at a glance: what the pieces can do against the ordered
// tolerance (Cp, Cpk and their 95 % intervals), the lot means in the order the lots came (ticks at
// the tolerance limits and 0, the individuals limits dotted), and the EWMA of the lot means with its
// limits, where a drift shows before lots fail. Tooltips name each lot L-n with its supplier lot.
import {
  CartesianGrid,
  ComposedChart,
  Line,
  ReferenceArea,
  ReferenceDot,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
  type TooltipContentProps,
} from 'recharts';
import {
  CHARACTERISTIC_LABELS,
  MIN_LOTS_FOR_DRIFT,
  type CharacteristicView,
  type DriftAlarmView,
  type LotMeanPoint,
} from '@shared/schemas/supplierPerformance';
import { formatDate } from '@shared/format';
import { signedError } from './format';

const INK = '#1e2421';
const MUTED = '#5b645f';
const GRID = '#eceae2';
const BAND = '#234a41';
const PASS = '#2e7d4f';
const FAIL = '#b3372f';
const LIMIT = '#2f6690';
const ALARM = '#b9821d';
const axisStyle = { fontSize: 11, fill: MUTED };

type Point = LotMeanPoint & { label: string };

function LotTooltip({ active, payload, view }: TooltipContentProps<number, string> & { view: CharacteristicView }) {
  if (!active || !payload?.length) return null;
  const point = payload[0].payload as Point;
  const c = view.characteristic;
  return (
    <div className="rounded border border-paper-line bg-paper-card px-2 py-1.5 text-xs shadow-sm">
      <p className="font-semibold">
        {point.lot.name} <span className="font-normal text-ink-muted">supplier lot {point.lot.supplierLot}</span>
      </p>
      <p className="text-ink-muted">received {formatDate(point.receivedAt)}</p>
      <p>lot mean {signedError(c, point.mean)}</p>
      {point.ewma !== null && (
        <p>
          EWMA {signedError(c, point.ewma, { finer: 1 })} (limits {signedError(c, point.ewmaLower, { finer: 1 })} to{' '}
          {signedError(c, point.ewmaUpper, { finer: 1 })})
        </p>
      )}
      <p className={point.outside ? 'text-state-fail' : 'text-ink-muted'}>
        {point.pieces} measured, {point.outside ? `${point.outside} outside the tolerance` : 'none outside the tolerance'}
        {point.failing > point.outside && `, ${point.failing} failing for any reason`}
      </p>
    </div>
  );
}

/** A symmetric range around 0 that shows the tolerance and every value, a little beyond. */
const spanOf = (values: (number | null)[], floor: number) => Math.max(floor, ...values.map((v) => Math.abs(v ?? 0))) * 1.15;

function ChartFrame({ title, note, children }: { title: string; note?: string; children: React.ReactElement }) {
  return (
    <figure className="min-w-0 rounded border border-paper-line bg-paper-card p-2">
      <figcaption className="px-1 text-xs font-medium text-ink">{title}</figcaption>
      {note && <p className="px-1 text-2xs text-ink-muted">{note}</p>}
      <div className="h-60">
        <ResponsiveContainer>{children}</ResponsiveContainer>
      </div>
    </figure>
  );
}

function FailingDot(props: { cx?: number; cy?: number; payload?: Point }) {
  const { cx, cy, payload } = props;
  if (cx === undefined || cy === undefined || !payload) return null;
  return <circle cx={cx} cy={cy} r={payload.outside ? 4.5 : 3} fill={payload.outside ? FAIL : PASS} stroke="#fff" strokeWidth={1} />;
}

function Capability({ view }: { view: CharacteristicView }) {
  const { capability: cap, pieces } = view;
  const c = view.characteristic;
  const tone = (value: number) => (value >= 1.33 ? 'text-state-pass' : value >= 1 ? 'text-state-quarantine' : 'text-state-fail');
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-1.5 text-sm sm:grid-cols-4">
      <div>
        <dt className="text-2xs tracking-wide text-ink-faint uppercase">Pieces</dt>
        <dd className="tabular-nums">{pieces.n}</dd>
      </div>
      <div>
        <dt className="text-2xs tracking-wide text-ink-faint uppercase">Mean ± s</dt>
        <dd className="tabular-nums">
          {signedError(c, pieces.mean)} ± {pieces.sd === null ? '—' : signedError(c, pieces.sd, { signed: false })}
        </dd>
      </div>
      <div>
        <dt className="text-2xs tracking-wide text-ink-faint uppercase">Cp (95 %)</dt>
        <dd className="tabular-nums">
          {cap ? (
            <>
              <span className={`font-semibold ${tone(cap.cp)}`}>{cap.cp.toFixed(2)}</span>{' '}
              <span className="text-xs text-ink-muted">
                {cap.cpLow.toFixed(2)}–{cap.cpHigh.toFixed(2)}
              </span>
            </>
          ) : (
            '—'
          )}
        </dd>
      </div>
      <div>
        <dt className="text-2xs tracking-wide text-ink-faint uppercase">Cpk (95 %)</dt>
        <dd className="tabular-nums">
          {cap ? (
            <>
              <span className={`font-semibold ${tone(cap.cpk)}`}>{cap.cpk.toFixed(2)}</span>{' '}
              <span className="text-xs text-ink-muted">
                {cap.cpkLow.toFixed(2)}–{cap.cpkHigh.toFixed(2)}
              </span>
            </>
          ) : (
            '—'
          )}
        </dd>
      </div>
    </dl>
  );
}

export function DriftCharts({ view, alarms }: { view: CharacteristicView; alarms: DriftAlarmView[] }) {
  const { name, unit } = CHARACTERISTIC_LABELS[view.characteristic];
  const c = view.characteristic;
  const tol = view.tolerance;
  const points: Point[] = view.lots.map((l) => ({ ...l, label: l.lot.name }));
  const individuals = view.individuals;
  const meanSpan = spanOf([...points.map((p) => p.mean), individuals?.upper ?? null, individuals?.lower ?? null], tol);
  const last = points[points.length - 1];
  const ewmaSpan = spanOf(
    points.flatMap((p) => [p.ewma, p.ewmaUpper, p.ewmaLower]),
    0,
  );
  const alarmed = alarms.filter((a) => a.characteristic === c);
  const tick = (v: number) => signedError(c, v);
  // Every value tick carries its unit; the lot axis says which way time runs.
  const lotAxis = (
    <XAxis
      dataKey="label"
      tick={axisStyle}
      interval="preserveStartEnd"
      minTickGap={8}
      label={{ value: 'lots, oldest first', position: 'insideBottom', offset: -2, style: axisStyle }}
      height={34}
    />
  );
  const tooltip = <Tooltip content={(props) => <LotTooltip {...(props as TooltipContentProps<number, string>)} view={view} />} />;

  return (
    <section className="space-y-2" aria-label={name}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="text-sm font-semibold">
          {name}{' '}
          <span className="font-normal text-ink-muted">
            ({unit}), ordered ±{tol}
            {unit === '°' ? '°' : ` ${unit}`}
          </span>
        </h3>
        {view.tolerancesDiffer && (
          <p className="text-2xs text-ink-muted">
            Lines of the period ordered different tolerances: Cp and Cpk judge each piece against its own; the charts show the latest.
          </p>
        )}
      </div>
      <Capability view={view} />
      {points.length === 0 ? (
        <p className="text-sm text-ink-muted">Nothing was measured in the period.</p>
      ) : (
        <div className="grid gap-3 lg:grid-cols-2">
          <ChartFrame
            title="Lot means"
            note={
              individuals
                ? `Dotted: individuals limits ${tick(individuals.lower)} to ${tick(individuals.upper)}. Red: lots with pieces outside the tolerance.`
                : undefined
            }
          >
            <ComposedChart data={points} margin={{ top: 8, right: 10, bottom: 4, left: 0 }}>
              <CartesianGrid stroke={GRID} />
              {lotAxis}
              <YAxis type="number" domain={[-meanSpan, meanSpan]} ticks={[-tol, 0, tol]} tickFormatter={tick} tick={axisStyle} width={62} allowDataOverflow />
              <ReferenceArea y1={-tol} y2={tol} fill={BAND} fillOpacity={0.06} />
              <ReferenceLine y={tol} stroke={FAIL} strokeDasharray="5 3" />
              <ReferenceLine y={-tol} stroke={FAIL} strokeDasharray="5 3" />
              <ReferenceLine y={0} stroke={INK} />
              {individuals && <ReferenceLine y={individuals.upper} stroke={LIMIT} strokeDasharray="2 3" />}
              {individuals && <ReferenceLine y={individuals.lower} stroke={LIMIT} strokeDasharray="2 3" />}
              {tooltip}
              <Line dataKey="mean" stroke={INK} strokeWidth={1.5} dot={<FailingDot />} isAnimationActive={false} />
            </ComposedChart>
          </ChartFrame>
          {!view.ewma ? (
            // Without a chart to draw, an empty frame would read as a broken one: say why instead.
            <figure className="min-w-0 rounded border border-paper-line bg-paper-card p-2">
              <figcaption className="px-1 text-xs font-medium text-ink">Drift: EWMA of the lot means</figcaption>
              <p className="px-1 py-3 text-sm text-ink-muted">
                {points.length < MIN_LOTS_FOR_DRIFT
                  ? `Drift is judged from ${MIN_LOTS_FOR_DRIFT} lots on; ${points.length} ${points.length === 1 ? 'lot was' : 'lots were'} measured in the period.`
                  : 'The lot means do not vary at all, so there is no spread to judge a drift against.'}
              </p>
            </figure>
          ) : (
            <ChartFrame
              title="Drift: EWMA of the lot means"
              note={`Weight ${view.ewma.lambda}, limits at ${view.ewma.width} standard deviations around 0 (the ordered value). Amber: alarms raised.`}
            >
              <ComposedChart data={points} margin={{ top: 8, right: 10, bottom: 4, left: 0 }}>
                <CartesianGrid stroke={GRID} />
                {lotAxis}
                <YAxis
                  type="number"
                  domain={[-ewmaSpan || -tol, ewmaSpan || tol]}
                  ticks={last?.ewmaUpper != null ? [last.ewmaLower!, 0, last.ewmaUpper] : [0]}
                  tickFormatter={(v: number) => signedError(c, v, { finer: 1 })}
                  tick={axisStyle}
                  width={78}
                />
                <ReferenceLine y={0} stroke={INK} />
                {tooltip}
                <Line dataKey="ewmaUpper" stroke={LIMIT} strokeDasharray="4 3" dot={false} type="stepAfter" isAnimationActive={false} />
                <Line dataKey="ewmaLower" stroke={LIMIT} strokeDasharray="4 3" dot={false} type="stepAfter" isAnimationActive={false} />
                <Line dataKey="ewma" stroke={INK} strokeWidth={1.5} dot={{ r: 2.5, fill: INK }} isAnimationActive={false} />
                {alarmed.map((a) => {
                  const at = points.find((p) => p.lot.id === a.lot.id);
                  return at && at.ewma !== null ? (
                    <ReferenceDot key={a.id} x={at.label} y={at.ewma} r={7} fill="none" stroke={ALARM} strokeWidth={2.5} />
                  ) : null;
                })}
              </ComposedChart>
            </ChartFrame>
          )}
        </div>
      )}
    </section>
  );
}
