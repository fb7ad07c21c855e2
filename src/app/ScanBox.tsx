// The header's scan box: a serial, a lot name (L-8) or a PO number, typed or sent by a keyboard-wedge
// scanner (its characters, fast, then Enter). Phaselot's labels hold exactly that text in their
// 2-D codes. One match opens its page; several are listed to choose from; none says so and offers
// the lists' searches. A scan made while no field has the focus is caught too: a burst of keys each
// within SCAN_GAP_MS of the last, ended by Enter, is no one's typing.
import { useEffect, useRef, useState, type FormEvent } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { ScanLine } from 'lucide-react';
import { can } from '@shared/policies';
import type { LookupMatch, LookupView } from '@shared/schemas/labels';
import type { Role } from '@shared/schemas/roles';
import { lotName } from '@shared/schemas/stock';
import { api } from '@/lib/api';

const SCAN_GAP_MS = 80;
const MIN_SCAN_LENGTH = 3;

const matchText = (match: LookupMatch) => {
  switch (match.kind) {
    case 'piece':
      return { title: `Serial ${match.serial}`, detail: `${match.partNumber}, lot ${lotName(match.lotId)}` };
    case 'lot':
      return { title: `Lot ${match.name}`, detail: match.partNumber };
    case 'purchase-order':
      return { title: `Purchase order ${match.number}`, detail: match.supplierName };
  }
};

type Answer = { code: string; matches: LookupMatch[] } | { code: string; error: string };

/** True while the focus is in something that takes text, where keys belong to that field. */
const typingInField = (target: EventTarget | null) =>
  target instanceof HTMLElement && (target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(target.tagName));

export function ScanBox({ user }: { user: { roles: readonly Role[] } }) {
  const navigate = useNavigate();
  const [text, setText] = useState('');
  const [answer, setAnswer] = useState<Answer | null>(null);
  const [pending, setPending] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  const look = async (raw: string) => {
    const code = raw.trim();
    if (!code) return;
    setPending(true);
    try {
      const view = await api<LookupView>('/lookup', { query: { code } });
      // The box empties after every look-up, so the next scan starts afresh; the answer names the code.
      setText('');
      if (view.matches.length === 1) {
        setAnswer(null);
        navigate(view.matches[0].path);
      } else setAnswer(view);
    } catch (error) {
      setAnswer({ code, error: error instanceof Error ? error.message : 'The look-up failed' });
    } finally {
      setPending(false);
    }
  };
  const lookRef = useRef(look);
  lookRef.current = look;

  // A scanner's burst while nothing takes text: the keys are gathered and looked up on Enter.
  useEffect(() => {
    let burst = '';
    let last = 0;
    const onKey = (event: KeyboardEvent) => {
      if (typingInField(event.target) || event.ctrlKey || event.metaKey || event.altKey) return;
      const now = event.timeStamp;
      if (now - last > SCAN_GAP_MS) burst = '';
      last = now;
      if (event.key === 'Enter') {
        if (burst.length >= MIN_SCAN_LENGTH) {
          event.preventDefault();
          void lookRef.current(burst);
        }
        burst = '';
      } else if (event.key.length === 1) burst += event.key;
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    void look(text);
  };
  const close = () => {
    setAnswer(null);
    input.current?.focus();
  };

  return (
    <div className="relative w-full max-w-sm">
      <form role="search" aria-label="Scan or find" onSubmit={submit} className="flex items-center gap-1.5">
        <ScanLine className="h-4 w-4 shrink-0 text-ink-muted" aria-hidden />
        <input
          ref={input}
          aria-label="Scan or type a serial, lot or PO"
          value={text}
          onChange={(e) => setText(e.target.value)}
          onKeyDown={(e) => e.key === 'Escape' && setAnswer(null)}
          autoComplete="off"
          spellCheck={false}
          placeholder="Scan a serial, lot (L-8) or PO"
          className="w-full rounded border border-paper-line bg-paper-card px-2 py-1 font-mono text-sm outline-none focus:border-frame-soft focus:ring-2 focus:ring-frame/15"
        />
        {pending && <span className="sr-only">Looking up…</span>}
      </form>
      {answer && (
        <div
          role="dialog"
          aria-label="Scan result"
          className="absolute top-full right-0 left-0 z-30 mt-1 rounded border border-paper-line bg-paper-card p-3 text-sm shadow-lg"
        >
          {'error' in answer ? (
            <p role="alert" className="text-state-fail">
              {answer.error}
            </p>
          ) : answer.matches.length === 0 ? (
            <>
              <p role="alert">
                Nothing found for <span className="font-mono font-medium">{answer.code}</span>
              </p>
              <p className="mt-2 text-xs text-ink-muted">Search for it in:</p>
              <ul className="mt-1 space-y-1">
                {can(user, 'lots.read') && (
                  <li>
                    <Link to={`/lots?q=${encodeURIComponent(answer.code)}`} onClick={() => setAnswer(null)}>
                      Lots (supplier lots, parts, suppliers)
                    </Link>
                  </li>
                )}
                {can(user, 'catalog.read') && (
                  <li>
                    <Link to={`/purchasing/orders?q=${encodeURIComponent(answer.code)}`} onClick={() => setAnswer(null)}>
                      Purchase orders
                    </Link>
                  </li>
                )}
              </ul>
            </>
          ) : (
            <>
              <p>
                <span className="font-mono font-medium">{answer.code}</span> names {answer.matches.length} records:
              </p>
              <ul className="mt-1 space-y-1">
                {answer.matches.map((match) => {
                  const { title, detail } = matchText(match);
                  return (
                    <li key={match.path + detail}>
                      <Link to={match.path} onClick={() => setAnswer(null)}>
                        {title}
                      </Link>{' '}
                      <span className="text-xs text-ink-muted">{detail}</span>
                    </li>
                  );
                })}
              </ul>
            </>
          )}
          <button type="button" onClick={close} className="mt-2 text-xs text-ink-muted underline">
            Close
          </button>
        </div>
      )}
    </div>
  );
}
