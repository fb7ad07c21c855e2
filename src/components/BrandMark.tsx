/** The Phaselot mark and name, for pages on the dark frame colour. */
export function BrandMark() {
  return (
    <span className="inline-flex items-center gap-2">
      <span aria-hidden className="relative h-6 w-6 rounded-full bg-frame-deep ring-2 ring-signal">
        <span className="absolute inset-x-1 top-1/2 h-0.5 -translate-y-1/2 bg-signal" />
      </span>
      <span className="text-lg font-semibold tracking-wide">Phaselot</span>
    </span>
  );
}
