const looks: Record<string, string> = {
  pass: 'bg-state-pass/10 text-state-pass border-state-pass/30',
  accept: 'bg-state-pass/10 text-state-pass border-state-pass/30',
  fail: 'bg-state-fail/10 text-state-fail border-state-fail/30',
  reject: 'bg-state-fail/10 text-state-fail border-state-fail/30',
  incomplete: 'bg-state-quarantine/10 text-state-quarantine border-state-quarantine/30',
  undecided: 'bg-state-quarantine/10 text-state-quarantine border-state-quarantine/30',
  'use-as-is': 'bg-state-hold/10 text-state-hold border-state-hold/30',
  unmeasured: 'bg-paper-sunk text-ink-muted border-paper-line',
};

export function VerdictBadge({ value }: { value: string }) {
  return (
    <span className={`inline-block rounded border px-1.5 py-px text-2xs font-medium tracking-wide uppercase ${looks[value] ?? looks.unmeasured}`}>{value}</span>
  );
}
