import type { LineMessage } from '@shared/serials';
import { parseSerialText } from '@shared/serials';

/** What the typed serials come to, as the clerk types: the count, the first and last, and each bad line. */
export function SerialPreview({ text, quantity, serverErrors }: { text: string; quantity: number; serverErrors: LineMessage[] }) {
  const list = parseSerialText(text);
  const errors = serverErrors.length ? serverErrors : list.errors;
  if (!text.trim() && errors.length === 0) return null;
  const count = list.serials.length;
  return (
    <div className="space-y-1 text-xs" aria-live="polite">
      {count > 0 && (
        <p className="text-ink-muted">
          <span data-testid="serial-count" className="font-medium text-ink">
            {count}
          </span>{' '}
          serial number{count === 1 ? '' : 's'}: <span className="font-mono">{list.serials[0]}</span>
          {count > 1 && (
            <>
              {' '}
              … <span className="font-mono">{list.serials[count - 1]}</span>
            </>
          )}
          {quantity > 0 && count !== quantity && <span className="ml-1 font-medium text-state-fail">— the quantity says {quantity}</span>}
        </p>
      )}
      {errors.length > 0 && (
        <ul role="alert" className="space-y-0.5 text-state-fail">
          {errors.slice(0, 20).map((e, i) => (
            <li key={i}>
              {e.line > 0 && <span className="font-medium">Line {e.line}: </span>}
              {e.message}
            </li>
          ))}
          {errors.length > 20 && <li>… and {errors.length - 20} more</li>}
        </ul>
      )}
    </div>
  );
}
