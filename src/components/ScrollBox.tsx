import type { ReactNode } from 'react';

/**
 * A box whose content (a wide or long table) scrolls inside it instead of widening the page. It takes
 * the keyboard's focus, so its content can be scrolled with the arrow keys too. It is the containing
 * block of what is positioned inside (visually hidden labels), which would otherwise widen the page.
 */
export function ScrollBox({ label, className = '', children }: { label: string; className?: string; children: ReactNode }) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className={`relative overflow-auto focus-visible:-outline-offset-2 ${className}`}>
      {children}
    </div>
  );
}
