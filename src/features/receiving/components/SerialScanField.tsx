// Serials scanned one by one into the receipt: a keyboard-wedge scanner types the serial and Enter;
// each is appended as a line of the serial list, a serial already in the list is refused.
import { useState, type KeyboardEvent } from 'react';
import { parseSerialText, SERIAL_PATTERN } from '@shared/serials';
import { inputClass } from '@/components/Field';

type Props = { serials: string; onChange: (serials: string) => void };

export function SerialScanField({ serials, onChange }: Props) {
  const [code, setCode] = useState('');
  const [message, setMessage] = useState<{ tone: 'ok' | 'refused'; text: string } | null>(null);
  const count = parseSerialText(serials).serials.length;

  const take = (event: KeyboardEvent<HTMLInputElement>) => {
    // Enter ends a scan; it must not submit the receipt.
    if (event.key !== 'Enter') return;
    event.preventDefault();
    const serial = code.trim();
    setCode('');
    if (!serial) return;
    if (!SERIAL_PATTERN.test(serial)) {
      setMessage({ tone: 'refused', text: `“${serial}” is not a serial number (letters, digits and . _ / -, at most 80 characters)` });
      return;
    }
    const list = parseSerialText(serials);
    const at = list.serials.indexOf(serial);
    if (at >= 0) {
      setMessage({ tone: 'refused', text: `${serial} is already in the list (line ${list.lines[at]}); not added again` });
      return;
    }
    onChange(serials.trim() ? `${serials.replace(/\s+$/, '')}\n${serial}` : serial);
    setMessage({ tone: 'ok', text: `Added ${serial}` });
  };

  return (
    <div className="flex flex-wrap items-center gap-2">
      <input
        aria-label="Scan a serial"
        value={code}
        onChange={(e) => setCode(e.target.value)}
        onKeyDown={take}
        autoComplete="off"
        spellCheck={false}
        placeholder="Scan, or type and press Enter"
        className={`${inputClass} w-72 max-w-full font-mono`}
      />
      <span className="text-xs text-ink-muted" aria-live="polite">
        <span data-testid="scanned-count" className="font-medium text-ink">
          {count}
        </span>{' '}
        in the list
        {message && <span className={message.tone === 'refused' ? 'ml-2 font-medium text-state-fail' : 'ml-2'}>· {message.text}</span>}
      </span>
    </div>
  );
}
