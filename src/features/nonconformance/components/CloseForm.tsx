import { useState } from 'react';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useCloseNcr } from '../api';

export function CloseForm({ ncrId }: { ncrId: number }) {
  const close = useCloseNcr(ncrId);
  const [note, setNote] = useState('');
  return (
    <form
      aria-label="Close the NCR"
      className="space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        close.mutate({ note });
      }}
    >
      {close.error && <Notice tone="error">{close.error.message}</Notice>}
      <Field label="Closing note (optional)" htmlFor="close-note">
        <input id="close-note" className={inputClass} value={note} onChange={(e) => setNote(e.target.value)} />
      </Field>
      <Button type="submit" look="secondary" disabled={close.isPending}>
        Close the NCR
      </Button>
    </form>
  );
}
