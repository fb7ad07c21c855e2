import type { SwitchingPhase } from '@shared/sampling';
import { SWITCHING_PHASE_LABELS } from '@shared/schemas/switching';
import { StateBadge, type Tone } from '@/components/StateBadge';

const PHASE_TONES: Record<SwitchingPhase, Tone> = { normal: 'info', tightened: 'quarantine', reduced: 'pass', stopped: 'fail' };

export function PhaseBadge({ phase }: { phase: SwitchingPhase }) {
  return <StateBadge state={phase} label={SWITCHING_PHASE_LABELS[phase]} tone={PHASE_TONES[phase]} />;
}
