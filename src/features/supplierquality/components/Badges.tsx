// The standing of a deviation or a corrective-action request as a state tag.
import { CAR_STATUS_LABELS, type CarStatus } from '@shared/schemas/correctiveActions';
import { DEVIATION_STATUS_LABELS, type DeviationStatus } from '@shared/schemas/deviations';
import { StateBadge, type Tone } from '@/components/StateBadge';

const DEVIATION_TONES: Record<DeviationStatus, Tone> = {
  'awaiting-approval': 'hold',
  current: 'pass',
  exhausted: 'neutral',
  expired: 'neutral',
  withdrawn: 'fail',
  earlier: 'neutral',
};
const CAR_TONES: Record<CarStatus, Tone> = { 'awaiting-response': 'quarantine', responded: 'hold', accepted: 'info', closed: 'neutral' };

export const DeviationBadge = ({ status }: { status: DeviationStatus }) => (
  <StateBadge state={status} label={DEVIATION_STATUS_LABELS[status]} tone={DEVIATION_TONES[status]} />
);

export const RequestBadge = ({ status, overdue }: { status: CarStatus; overdue?: boolean }) => (
  <span className="inline-flex flex-wrap gap-1">
    <StateBadge state={status} label={CAR_STATUS_LABELS[status]} tone={CAR_TONES[status]} />
    {overdue && <StateBadge state="overdue" label="Overdue" tone="fail" />}
  </span>
);
