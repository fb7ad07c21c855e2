/** A part number with its description beneath, as list cells show parts. */
export function PartLabel({ number, description }: { number: string; description: string }) {
  return (
    <>
      <span className="font-mono">{number}</span>
      <span className="block text-xs text-ink-muted">{description}</span>
    </>
  );
}
