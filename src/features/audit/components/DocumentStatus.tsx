import { formatDateTime } from '@shared/format';
/** Whether an issued document still stands or was revoked by a later decision on its lot. */
export function DocumentStatus({ revokedAt }: { revokedAt: string | null }) {
  if (!revokedAt)
    return (
      <span className="inline-block rounded border border-state-pass/30 bg-state-pass/10 px-1.5 py-px text-2xs font-medium tracking-wide text-state-pass uppercase">
        current
      </span>
    );
  return (
    <span
      title={`Revoked ${formatDateTime(revokedAt)}`}
      className="inline-block rounded border border-state-fail/30 bg-state-fail/10 px-1.5 py-px text-2xs font-medium tracking-wide text-state-fail uppercase"
    >
      revoked
    </span>
  );
}
