import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { verifyQuerySchema } from '@shared/schemas/certificates';
import { BrandMark } from '@/components/BrandMark';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useVerification } from '../api';
import { VerificationCard } from '../components/VerificationCard';

type VerifyInput = z.infer<typeof verifyQuerySchema>;

/** Public: whoever holds a Phaselot document checks it here, by the number and hash its QR code carries. */
export function VerifyPage() {
  const [params, setParams] = useSearchParams();
  const number = params.get('number')?.trim() ?? '';
  const hash = params.get('hash')?.trim().toLowerCase() ?? '';
  const verification = useVerification(number, hash);
  const form = useForm<VerifyInput>({ resolver: zodResolver(verifyQuerySchema), values: { number, hash } });
  const submit = form.handleSubmit((values) => setParams(values));

  return (
    <div className="min-h-screen">
      <header className="bg-frame py-4 text-white">
        <div className="mx-auto flex max-w-2xl items-center gap-2 px-6">
          <BrandMark />
          <span className="ml-2 text-sm text-white/70">Document verification</span>
        </div>
      </header>
      <main className="mx-auto max-w-2xl space-y-5 px-6 py-6">
        <div>
          <h1>Check a certificate or inspection report</h1>
          <p className="mt-1 text-sm text-ink-muted">
            Scan the QR code on the document, or type its number and the data SHA-256 printed beside the code. The answer comes from the records of the site
            that issued it.
          </p>
        </div>
        <form aria-label="Verify a document" onSubmit={submit} noValidate className="space-y-3 rounded border border-paper-line bg-paper-card px-4 py-3">
          <Field label="Document number" htmlFor="verify-number" error={form.formState.errors.number?.message}>
            <input id="verify-number" placeholder="PLC-2026-00001" className={`${inputClass} font-mono`} {...form.register('number')} />
          </Field>
          <Field label="Data SHA-256" htmlFor="verify-hash" error={form.formState.errors.hash?.message}>
            <input id="verify-hash" className={`${inputClass} font-mono text-xs`} spellCheck={false} {...form.register('hash')} />
          </Field>
          <Button type="submit">Check document</Button>
        </form>
        {verification.isFetching && <p className="text-ink-muted">Checking…</p>}
        {verification.error && <Notice tone="error">{verification.error.message}</Notice>}
        {verification.data && !verification.isFetching && <VerificationCard result={verification.data} />}
        <p className="text-xs text-ink-faint">
          A genuine document records the issuing site's lot decision; acceptance remains the responsibility of that site's quality system and its procedures.
        </p>
      </main>
    </div>
  );
}
