import type { ReactNode } from 'react';
import { DISPOSITION_LABELS, type Disposition } from '@shared/inspection/lotVerdict';
import { Details, Panel } from '@/components/Details';
import { StateBadge, type Tone } from '@/components/StateBadge';
import type { LotInspectionView } from '@shared/schemas/inspection';
import { DocumentLink } from './DocumentLink';
import { formatDateTime } from '@shared/format';

const DECISION_TONES: Record<Disposition, Tone> = { accept: 'pass', reject: 'fail', sort: 'hold', 'use-as-is': 'hold' };

type Props = {
  disposition: LotInspectionView['dispositions'][number];
  /** The documents in force, i.e. those this decision issued (superseding revokes the earlier ones). */
  documents: LotInspectionView['documents'];
  /** Notices above the decision. */
  children?: ReactNode;
  /** What may be done with the decision, below it. */
  actions?: ReactNode;
};

/** The decision in force on a lot as it was signed: who, when, what the signature meant, the note and
 * the documents it issued. */
export function SignedDecision({ disposition: d, documents, actions, children }: Props) {
  return (
    <Panel title="Signed decision">
      <div className="space-y-3">
        {children}
        <p className="flex flex-wrap items-center gap-2">
          <StateBadge state={d.decision} tone={DECISION_TONES[d.decision]} label={DISPOSITION_LABELS[d.decision]} />
          <span className="text-sm">
            signed by <strong>{d.signer ?? 'a former user'}</strong>, {formatDateTime(d.signedAt)}
          </span>
        </p>
        <Details
          columns={2}
          items={[
            ['Meaning of the signature', <q key="m">{d.meaning}</q>],
            [d.deviationNumber ? 'Justification' : 'Note', d.justification || <span className="text-ink-faint">No note was given.</span>],
            ...(d.deviationNumber
              ? [
                  [
                    'Deviation',
                    <span key="dv" className="font-mono">
                      {d.deviationNumber}
                    </span>,
                  ] as [string, ReactNode],
                ]
              : []),
            [
              'Documents',
              documents.length ? (
                <ul key="docs" className="space-y-0.5">
                  {documents.map((doc) => (
                    <li key={doc.id}>
                      <DocumentLink document={doc} />
                    </li>
                  ))}
                </ul>
              ) : (
                <span className="text-ink-faint">None in force.</span>
              ),
            ],
          ]}
        />
        {actions}
      </div>
    </Panel>
  );
}
