import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { can } from '@shared/policies';
import { defectCodeInputSchema, type DefectCodeInput, type DefectCodeView } from '@shared/schemas/nonconformance';
import { Button } from '@/components/Button';
import { Panel } from '@/components/Details';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { StateBadge } from '@/components/StateBadge';
import { showServerFieldErrors } from '@/lib/formErrors';
import { useSession } from '@/lib/session';
import { useDefectCodes, useSaveDefectCode } from '../api';
import { NcrTabs } from '../components/NcrTabs';

/** Adds a code, or changes the one being edited. */
function DefectCodeForm({ editing, onDone }: { editing: DefectCodeView | null; onDone(): void }) {
  const save = useSaveDefectCode();
  const form = useForm<DefectCodeInput>({
    resolver: zodResolver(defectCodeInputSchema),
    values: editing ? { code: editing.code, label: editing.label, active: editing.active } : { code: '', label: '', active: true },
  });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) =>
    save.mutate({ ...values, id: editing?.id }, { onSuccess: () => (form.reset(), onDone()), onError: (error) => showServerFieldErrors(error, form.setError) }),
  );
  return (
    <form onSubmit={submit} noValidate aria-label={editing ? 'Change defect code' : 'Add a defect code'} className="flex flex-wrap items-end gap-3">
      <Field label="Code" htmlFor="defect-code" error={errors.code?.message}>
        <input id="defect-code" className={`${inputClass} w-44 font-mono`} {...form.register('code')} />
      </Field>
      <Field label="Label" htmlFor="defect-label" error={errors.label?.message}>
        <input id="defect-label" className={`${inputClass} w-80`} {...form.register('label')} />
      </Field>
      <label className="flex items-center gap-2 pb-2 text-sm">
        <input type="checkbox" {...form.register('active')} /> In use
      </label>
      <Button type="submit" disabled={save.isPending}>
        {editing ? 'Save' : 'Add'}
      </Button>
      {editing && (
        <Button look="quiet" onClick={onDone}>
          Cancel
        </Button>
      )}
      {save.error && !Object.keys(errors).length && <Notice tone="error">{save.error.message}</Notice>}
    </form>
  );
}

export function DefectCodesPage() {
  const { data: user } = useSession();
  const codes = useDefectCodes();
  const [editing, setEditing] = useState<DefectCodeView | null>(null);
  const mayManage = can(user, 'defect-codes.manage');
  return (
    <div>
      <PageHeader title="Nonconformance" subtitle="The site's catalogue of defect codes that NCRs name. Codes no longer wanted are retired, never deleted." />
      <NcrTabs />
      <div className="max-w-4xl space-y-3">
        {mayManage && (
          <Panel title={editing ? `Change ${editing.code}` : 'Add a defect code'}>
            <DefectCodeForm editing={editing} onDone={() => setEditing(null)} />
          </Panel>
        )}
        {codes.error && <Notice tone="error">{codes.error.message}</Notice>}
        <div className="overflow-x-auto rounded border border-paper-line bg-paper-card">
          <table className="w-full text-sm">
            <thead className="bg-paper-sunk text-left text-xs text-ink-muted">
              <tr>
                <th className="px-3 py-1.5">Code</th>
                <th className="px-3 py-1.5">Label</th>
                <th className="px-3 py-1.5">NCRs naming it</th>
                <th className="px-3 py-1.5">State</th>
                {mayManage && <th className="px-3 py-1.5" />}
              </tr>
            </thead>
            <tbody>
              {codes.data?.data.map((code) => (
                <tr key={code.id} className="border-t border-paper-line">
                  <td className="px-3 py-1.5 font-mono">{code.code}</td>
                  <td className="px-3 py-1.5">{code.label}</td>
                  <td className="px-3 py-1.5 tabular-nums">{code.inUse}</td>
                  <td className="px-3 py-1.5">
                    {code.active ? <StateBadge state="open" label="in use" tone="pass" /> : <StateBadge state="closed" label="retired" />}
                  </td>
                  {mayManage && (
                    <td className="px-3 py-1.5 text-right">
                      <Button look="quiet" onClick={() => setEditing(code)}>
                        Change
                      </Button>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </div>
  );
}
