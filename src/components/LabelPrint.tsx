// Choosing and opening labels: what to print (when there is a choice) and on which label stock. The
// stock is remembered in this browser, since a station keeps one printer loaded with one stock.
import { useState } from 'react';
import { Printer } from 'lucide-react';
import { LABEL_STOCKS, LABEL_STOCK_LABELS, type LabelStock } from '@shared/schemas/labels';
import { apiUrl } from '@/lib/api';
import { inputClass } from './Field';

const STORED_STOCK = 'phaselot.labelStock';

function storedStock(): LabelStock {
  const stored = window.localStorage.getItem(STORED_STOCK);
  return LABEL_STOCKS.find((stock) => stock === stored) ?? '57x32mm';
}

type Props<Kind extends string> = {
  /** The API path of the labels, without its query. */
  path: string;
  /** What may be printed; the first is chosen at first. Without kinds the path prints one label. */
  kinds?: { value: Kind; label: string }[];
  name: string;
};

export function LabelPrint<Kind extends string>({ path, kinds = [], name }: Props<Kind>) {
  const [stock, setStock] = useState<LabelStock>(storedStock);
  const [kind, setKind] = useState<Kind | undefined>(kinds[0]?.value);
  const chooseStock = (value: LabelStock) => {
    setStock(value);
    window.localStorage.setItem(STORED_STOCK, value);
  };
  return (
    <div className="flex flex-wrap items-center gap-2" role="group" aria-label={name}>
      {kinds.length > 1 && (
        <select aria-label="What to print" value={kind} onChange={(e) => setKind(e.target.value as Kind)} className={inputClass}>
          {kinds.map((k) => (
            <option key={k.value} value={k.value}>
              {k.label}
            </option>
          ))}
        </select>
      )}
      <select aria-label="Label stock" value={stock} onChange={(e) => chooseStock(e.target.value as LabelStock)} className={inputClass}>
        {LABEL_STOCKS.map((s) => (
          <option key={s} value={s}>
            {LABEL_STOCK_LABELS[s]}
          </option>
        ))}
      </select>
      <a
        href={apiUrl(path, { kind, stock })}
        target="_blank"
        rel="noreferrer"
        className="inline-flex items-center gap-1.5 rounded border border-paper-line bg-paper-card px-3 py-1.5 text-sm text-ink no-underline hover:bg-paper-sunk"
      >
        <Printer className="h-4 w-4" aria-hidden />
        {kinds.length > 0 ? 'Open labels (PDF)' : 'Open label (PDF)'}
      </a>
    </div>
  );
}
