// The signed release of reworked pieces, re-inspected conforming, to a stock bin.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { NCR_SIGNATURE_MEANINGS, reworkReleaseSchema, type NcrView, type ReworkReleaseInput } from '@shared/schemas/nonconformance';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { SignatureFields } from '@/components/SignatureFields';
import { counted } from '@/lib/plural';
import { useReleaseRework, useStockBins } from '../api';

type Props = { ncr: NcrView; selected: number[]; onSigned(summary: string): void };

export function ReworkReleaseForm({ ncr, selected, onSigned }: Props) {
  const release = useReleaseRework(ncr.id);
  const bins = useStockBins();
  const form = useForm<ReworkReleaseInput>({
    resolver: zodResolver(reworkReleaseSchema),
    defaultValues: { pieceIds: [], toLocationId: undefined as unknown as number, reference: '', password: '', meaningAcknowledged: false as unknown as true },
  });
  const errors = form.formState.errors;
  const inRework = ncr.pieces.filter((p) => p.disposition?.decision === 'rework' && !p.reworkReleased);
  const chosen = selected.length ? inRework.filter((p) => selected.includes(p.pieceId)) : inRework;
  const submit = form.handleSubmit((values) =>
    release.mutate(
      { ...values, pieceIds: chosen.map((p) => p.pieceId) },
      {
        onSuccess: () => onSigned(`${counted(chosen.length, 'reworked piece')} released to stock.`),
        onError: () => {
          form.setValue('password', '');
          form.setFocus('password');
        },
      },
    ),
  );
  return (
    <form onSubmit={submit} noValidate aria-label="Release reworked pieces" className="space-y-3 rounded border border-paper-line bg-paper-card p-4">
      <h2>Release reworked pieces</h2>
      <p className="text-sm text-ink-muted">
        <span className="font-mono text-xs">{chosen.map((p) => p.serial).join(', ') || 'No ticked piece is in rework.'}</span>
      </p>
      {release.error && <Notice tone="error">{release.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Stock bin" htmlFor="rework-bin" error={errors.toLocationId?.message && 'Choose the stock bin'}>
          <select id="rework-bin" className={inputClass} {...form.register('toLocationId')}>
            <option value="">Choose…</option>
            {bins.data?.map((b) => (
              <option key={b.id} value={b.id}>
                {b.code} · {b.name}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Re-inspection record" htmlFor="rework-reference" hint="Report number or bench file name." error={errors.reference?.message}>
          <input id="rework-reference" className={inputClass} {...form.register('reference')} />
        </Field>
      </div>
      <SignatureFields meaning={NCR_SIGNATURE_MEANINGS['rework-release']} register={form.register} errors={errors} idPrefix="rework" />
      <Button type="submit" disabled={release.isPending || chosen.length === 0}>
        {release.isPending ? 'Signing…' : 'Sign: release to stock'}
      </Button>
    </form>
  );
}
