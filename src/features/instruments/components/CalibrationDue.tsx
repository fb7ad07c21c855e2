import { calibrationDueStatus, type CalibrationDueState } from '@shared/calibration';
import { StateBadge, type Tone } from '@/components/StateBadge';

const LOOKS: Record<CalibrationDueState, { label: string; tone: Tone }> = {
  current: { label: 'In calibration', tone: 'pass' },
  'due-soon': { label: 'Due soon', tone: 'quarantine' },
  lapsed: { label: 'Lapsed', tone: 'fail' },
};

/** An instrument's calibration standing in words, with its due date. */
export function CalibrationDue({ dueOn }: { dueOn: string }) {
  const { state, words } = calibrationDueStatus(dueOn);
  return (
    <span className="inline-flex flex-wrap items-center gap-1.5">
      <StateBadge state={`calibration-${state}`} label={LOOKS[state].label} tone={LOOKS[state].tone} />
      <span className="text-xs whitespace-nowrap">{words}</span>
    </span>
  );
}
