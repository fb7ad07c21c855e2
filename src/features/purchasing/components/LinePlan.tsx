// Under a PO line: the sampling plan its quantity, inspection level and AQL give on normal
// inspection, from the plan look-up. Switching may later put a lot on tightened or reduced plans.
import { codeLetterText } from '@shared/sampling/plan';
import type { InspectionLevel } from '@shared/sampling/tables';
import { useSamplingPlan } from '../api';

type Props = { quantity: unknown; level: InspectionLevel; aql: unknown; hundredPercent: unknown };

export function LinePlan({ quantity, level, aql, hundredPercent }: Props) {
  const lotSize = Number(quantity);
  const complete = String(quantity ?? '').trim() !== '' && Number.isInteger(lotSize) && lotSize > 0;
  const plan = useSamplingPlan(complete ? { lotSize, level, aql: Number(aql), severity: 'normal' } : null);
  if (!complete) return <span className="text-ink-faint">The sampling plan shows once the quantity is given.</span>;
  if (plan.error) return <span className="text-state-fail">{plan.error.message}</span>;
  if (!plan.data) return <span className="text-ink-faint">Looking up the sampling plan…</span>;
  const { codeLetter, planLetter, sampleSize, accept, reject } = plan.data;
  const everyPiece = hundredPercent
    ? '; 100 % ordered, every piece inspected'
    : plan.data.hundredPercent
      ? `; n reaches the ${lotSize} pieces, every piece inspected`
      : '';
  return (
    <span>
      Normal inspection:{' '}
      <span data-testid="line-plan">
        Code letter {codeLetterText(codeLetter, planLetter)}, n = {sampleSize}, Ac {accept} / Re {reject}
      </span>
      {everyPiece}
    </span>
  );
}
