import type { FormEvent, ReactNode } from 'react';
import { Button } from '@/components/Button';

/** A row of filter fields applied together; fields read their values from the form on submit. */
export function FilterBar({
  label,
  onApply,
  onClear,
  children,
}: {
  label: string;
  onApply: (values: Record<string, string>) => void;
  onClear: () => void;
  children: ReactNode;
}) {
  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const values = Object.fromEntries([...new FormData(event.currentTarget).entries()].map(([key, value]) => [key, String(value).trim()]));
    onApply(values);
  };
  return (
    <form aria-label={label} onSubmit={submit} className="mb-3 flex flex-wrap items-end gap-3 rounded border border-paper-line bg-paper-card px-3 py-2.5">
      {children}
      <div className="flex gap-2">
        <Button type="submit">Apply</Button>
        <Button type="reset" look="quiet" onClick={onClear}>
          Clear
        </Button>
      </div>
    </form>
  );
}
