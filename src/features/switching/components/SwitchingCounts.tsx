// The counts the switching rules of ISO 2859-1 (clause 9) act on, each with the threshold it is
// measured against, so a reader sees how far the supplier and part are from the next switch.
import type { SwitchingState } from '@shared/sampling';

function Meter({ value, of, tone }: { value: number; of: number; tone: 'pass' | 'fail' }) {
  const share = Math.min(1, value / of);
  return (
    <div className="mt-1 h-1.5 w-full rounded-full bg-paper-sunk" aria-hidden>
      <div className={`h-1.5 rounded-full ${tone === 'pass' ? 'bg-state-pass' : 'bg-state-fail'}`} style={{ width: `${share * 100}%` }} />
    </div>
  );
}

function Count({ label, value, of, tone, hint }: { label: string; value: number; of: number; tone: 'pass' | 'fail'; hint: string }) {
  return (
    <div>
      <dt className="flex items-baseline justify-between gap-2 text-xs text-ink-muted">
        {label}
        <span className="font-mono text-sm text-ink">
          {value}
          <span className="text-ink-faint"> / {of}</span>
        </span>
      </dt>
      <dd>
        <Meter value={value} of={of} tone={tone} />
        <p className="mt-0.5 text-2xs text-ink-faint">{hint}</p>
      </dd>
    </div>
  );
}

export function SwitchingCounts({ state, reducedEnabled }: { state: SwitchingState; reducedEnabled: boolean }) {
  const notAccepted = state.recentResults.filter((accepted) => !accepted).length;
  return (
    <dl className="space-y-3">
      <div>
        <dt className="text-xs text-ink-muted">Latest lots on normal inspection (oldest first)</dt>
        <dd className="mt-1">
          <div className="flex items-center gap-1" role="img" aria-label={`${state.recentResults.length} lots, ${notAccepted} not accepted`}>
            {state.recentResults.length === 0 && <span className="text-xs text-ink-faint">None since the last switch.</span>}
            {state.recentResults.map((accepted, i) => (
              <span
                key={i}
                title={accepted ? 'accepted' : 'not accepted'}
                className={`inline-flex h-5 w-5 items-center justify-center rounded-sm text-2xs font-semibold text-white ${accepted ? 'bg-state-pass' : 'bg-state-fail'}`}
              >
                {accepted ? 'A' : 'N'}
              </span>
            ))}
          </div>
          {/* Inside the dd: a list of terms holds nothing but terms and their descriptions. */}
          <p className="mt-0.5 text-2xs text-ink-faint">2 not accepted among 5 or fewer consecutive lots start tightened inspection.</p>
        </dd>
      </div>
      <Count
        label="Switching score"
        value={state.switchingScore}
        of={30}
        tone="pass"
        hint={`At 30, with steady production, normal gives way to reduced inspection${reducedEnabled ? '' : ' (not enabled for this site)'}.`}
      />
      <Count label="Accepted in a row" value={state.consecutiveAccepted} of={5} tone="pass" hint="On tightened inspection, 5 in a row return to normal." />
      <Count label="Not accepted on tightened" value={state.tightenedCount} of={5} tone="fail" hint="5 while on tightened inspection discontinue acceptance." />
    </dl>
  );
}
