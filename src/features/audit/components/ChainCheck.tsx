import { ShieldCheck } from 'lucide-react';
import { Button } from '@/components/Button';
import { Notice } from '@/components/Notice';
import { useVerifyChain } from '../api';

/** Re-computes the trail's hash chain on the server and shows where it breaks, if anywhere. */
export function ChainCheck() {
  const verify = useVerifyChain();
  const report = verify.data;
  return (
    <div className="space-y-2">
      <Button look="secondary" onClick={() => verify.mutate()} disabled={verify.isPending}>
        <ShieldCheck className="h-4 w-4" aria-hidden /> {verify.isPending ? 'Verifying…' : 'Verify chain'}
      </Button>
      {verify.error && <Notice tone="error">{verify.error.message}</Notice>}
      {report?.intact && (
        <Notice tone="info" title="Chain intact">
          All {report.checked} events match their digests, each links to the one before it, and the head names the last.
        </Notice>
      )}
      {report && !report.intact && (
        <Notice tone="error" title="Chain broken">
          <p>
            {report.checked} events checked; these rows no longer match the chain{report.problems.length === 50 ? ' (first 50 shown)' : ''}:
          </p>
          <ul className="mt-1 font-mono text-xs">
            {report.problems.map((p) => (
              <li key={`${p.seq}-${p.problem}`}>
                position {p.seq}
                {p.id ? ` (event ${p.id})` : ''}: {p.problem}
              </li>
            ))}
          </ul>
        </Notice>
      )}
    </div>
  );
}
