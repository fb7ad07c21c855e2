import type { ReactNode } from 'react';
import { BrandMark } from '@/components/BrandMark';

/** The frame of the pages used signed out (sign-in, forgotten and new password): the product's
 * panel beside a narrow column for the form. */
export function AuthFrame({ children }: { children: ReactNode }) {
  return (
    <div className="grid min-h-screen md:grid-cols-[minmax(0,5fr)_minmax(0,4fr)]">
      <section className="hidden flex-col justify-between bg-frame p-10 text-white md:flex">
        <BrandMark />
        <div className="max-w-md">
          <p className="text-2xl leading-snug font-semibold">Every wave plate checked against its order before it goes into an instrument.</p>
          <p className="mt-3 text-sm text-white/70">
            Receiving, quarantine, polarimetric inspection, signed dispositions and serial traceability for retarder lots.
          </p>
        </div>
        <p className="text-xs text-white/75">Lot decisions remain the responsibility of your site's quality system and its procedures.</p>
      </section>
      <section className="flex items-center justify-center p-6">
        <div className="w-full max-w-xs">{children}</div>
      </section>
    </div>
  );
}
