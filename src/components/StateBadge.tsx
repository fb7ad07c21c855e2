// A state as a small coloured tag. The tone colours are reserved for states: quarantine amber,
// pass green, fail red, hold violet, information blue.
import { wordsOf } from '@shared/format';

const tones = {
  quarantine: 'bg-state-quarantine/10 text-state-quarantine border-state-quarantine/30',
  pass: 'bg-state-pass/10 text-state-pass border-state-pass/30',
  fail: 'bg-state-fail/10 text-state-fail border-state-fail/30',
  hold: 'bg-state-hold/10 text-state-hold border-state-hold/30',
  info: 'bg-state-info/10 text-state-info border-state-info/30',
  neutral: 'bg-paper-sunk text-ink-muted border-paper-line',
} as const;
export type Tone = keyof typeof tones;

/** The tone of each lot, piece, location and PO state Phaselot shows. */
const STATE_TONES: Record<string, Tone> = {
  quarantine: 'quarantine',
  inspection: 'info',
  'inspection-hold': 'hold',
  'awaiting-disposition': 'hold',
  accepted: 'pass',
  'use-as-is': 'hold',
  rejected: 'fail',
  // A sort holds the lot until every piece has its verdict; a sorted lot went both ways.
  sorting: 'hold',
  sorted: 'neutral',
  held: 'hold',
  'material-review': 'hold',
  'in-stock': 'pass',
  stock: 'pass',
  issued: 'info',
  returned: 'fail',
  'return-to-vendor': 'fail',
  open: 'info',
  closed: 'neutral',
  // NCRs between opening and closing; pieces that have left the site.
  dispositioned: 'hold',
  scrapped: 'neutral',
  'shipped-back': 'neutral',
};

export function StateBadge({ state, label, tone }: { state: string; label?: string; tone?: Tone }) {
  return (
    <span
      data-state={state}
      className={`inline-block rounded border px-1.5 py-px text-2xs font-medium tracking-wide whitespace-nowrap uppercase ${tones[tone ?? STATE_TONES[state] ?? 'neutral']}`}
    >
      {label ?? wordsOf(state)}
    </span>
  );
}
