import type { LotInspectionView } from '@shared/schemas/inspection';

const KIND_LABELS = { certificate: 'certificate of conformance', 'inspection-report': 'inspection report' } as const;

/** A lot document by its number, opening its PDF, with what kind of document it is. */
export function DocumentLink({ document }: { document: LotInspectionView['documents'][number] }) {
  return (
    <>
      <a href={`/api/documents/${encodeURIComponent(document.number)}.pdf`} target="_blank" rel="noreferrer" className="font-mono">
        {document.number}
      </a>{' '}
      {KIND_LABELS[document.kind]}
      {document.revokedAt && <span className="ml-1 font-medium text-state-fail">revoked</span>}
    </>
  );
}
