// One component per dashboard section: the work of a role, counts and ages at a glance.
import { formatDate, formatDateTime, plural, wholeNumber } from '@shared/format';
import type { AuditSection, DashboardLotRow, InspectionSection, PurchasingSection, QualitySection, ReceivingSection } from '@shared/schemas/dashboard';
import { CAR_STATUS_LABELS } from '@shared/schemas/correctiveActions';
import { INSTRUMENT_KIND_LABELS } from '@shared/schemas/instruments';
import { LOT_STATE_LABELS, lotName } from '@shared/schemas/stock';
import { StateBadge } from '@/components/StateBadge';
import { Bars, DailyColumns } from './Bars';
import { Panel, PanelRow } from './Panel';

function SectionFrame({ title, children }: { title: string; children: React.ReactNode }) {
  const id = `section-${title.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
  return (
    <section aria-labelledby={id} data-testid={id} className="space-y-2">
      <h2 id={id} className="text-xs font-semibold tracking-wider text-ink-muted uppercase">
        {title}
      </h2>
      <div className="grid gap-3 md:grid-cols-2 xl:grid-cols-3">{children}</div>
    </section>
  );
}

const Late = ({ children }: { children: React.ReactNode }) => <span className="font-medium text-state-fail">{children}</span>;

/** Days waiting, coloured once it is a week or more. */
const Age = ({ days, late = 7 }: { days: number; late?: number }) => (days >= late ? <Late>{plural(days, 'day')}</Late> : <span>{plural(days, 'day')}</span>);

function LotRows({ rows, to }: { rows: DashboardLotRow[]; to: (lotId: number) => string }) {
  return rows.map((lot) => (
    <PanelRow
      key={lot.lotId}
      to={to(lot.lotId)}
      title={
        <>
          {lotName(lot.lotId)} · {lot.partNumber}
        </>
      }
      detail={`${lot.supplier}, ${plural(lot.quantity, 'piece')}, received ${formatDate(lot.receivedOn)}`}
      aside={
        <>
          <StateBadge state={lot.state} label={LOT_STATE_LABELS[lot.state]} />
          <span className="mt-0.5 block">
            <Age days={lot.days} />
          </span>
        </>
      }
    />
  ));
}

export function Receiving({ section }: { section: ReceivingSection }) {
  const { due, awaited } = section;
  return (
    <SectionFrame title="Receiving">
      <Panel
        title="PO lines due"
        total={due.total}
        unit={due.total === 1 ? 'line in 14 days' : 'lines in 14 days'}
        shown={due.rows.length}
        all={{ to: '/purchasing/orders', label: 'All purchase orders' }}
        alert={due.late > 0 && <Late>{plural(due.late, 'line')} past due</Late>}
        empty="No line is due in the next two weeks."
      >
        {due.rows.map((line) => (
          <PanelRow
            key={`${line.purchaseOrderId}-${line.line}`}
            to={`/purchasing/orders/${line.purchaseOrderId}`}
            title={`${line.purchaseOrder} line ${line.line} · ${line.partNumber}`}
            detail={`${line.supplier}, ${plural(line.outstanding, 'piece')} still to come`}
            aside={
              <>
                <span className="block">{formatDate(line.dueOn)}</span>
                {line.daysLate > 0 ? (
                  <Late>{plural(line.daysLate, 'day')} late</Late>
                ) : line.daysLate === 0 ? (
                  'due today'
                ) : (
                  `in ${plural(-line.daysLate, 'day')}`
                )}
              </>
            }
          />
        ))}
      </Panel>
      <Panel
        title="Shipments to receive"
        total={awaited.lines}
        unit={awaited.lines === 1 ? 'open line' : 'open lines'}
        shown={0}
        all={{ to: '/receiving/new', label: 'Receive a shipment' }}
        empty="Every open PO line has been received."
      >
        <li className="px-3 py-2 text-sm">{plural(awaited.pieces, 'piece')} awaited on open purchase orders.</li>
      </Panel>
      <Bars title="Pieces awaited, by supplier" bars={awaited.bySupplier} unit="pieces" />
    </SectionFrame>
  );
}

export function Inspection({ section }: { section: InspectionSection }) {
  return (
    <SectionFrame title="Inspection">
      <Panel
        title="Lots to measure"
        total={section.toMeasure.total}
        unit={section.toMeasure.total === 1 ? 'lot' : 'lots'}
        shown={section.toMeasure.rows.length}
        all={{ to: '/inspection', label: 'The whole inspection queue' }}
        empty="No lot waits for measurement."
      >
        <LotRows rows={section.toMeasure.rows} to={(id) => `/inspection/lots/${id}`} />
      </Panel>
      <Bars title="Lots waiting, by days in quarantine" bars={section.ages} unit="lots" />
    </SectionFrame>
  );
}

export function Quality({ section }: { section: QualitySection }) {
  const { awaitingSignature, openNcrs, calibrations } = section;
  return (
    <SectionFrame title="Quality">
      <Panel
        title="Lots awaiting signature"
        total={awaitingSignature.total}
        unit={awaitingSignature.total === 1 ? 'lot' : 'lots'}
        shown={awaitingSignature.rows.length}
        all={{ to: '/lots?state=awaiting-disposition', label: 'Every lot awaiting a decision' }}
        empty="No lot waits for a signed decision."
      >
        <LotRows rows={awaitingSignature.rows} to={(id) => `/inspection/lots/${id}`} />
      </Panel>
      <Panel
        title="Open NCRs"
        total={openNcrs.total}
        unit={openNcrs.total === 1 ? 'NCR' : 'NCRs'}
        shown={openNcrs.rows.length}
        all={{ to: '/nonconformances', label: 'All nonconformance reports' }}
        empty="No NCR is open."
      >
        {openNcrs.rows.map((ncr) => (
          <PanelRow
            key={ncr.id}
            to={`/nonconformances/${ncr.id}`}
            title={`${ncr.number} · ${ncr.partNumber}`}
            detail={`${ncr.supplier}, opened ${formatDate(ncr.openedOn)}`}
            aside={
              <>
                <StateBadge state={ncr.status} label={ncr.status === 'open' ? 'Open' : 'Dispositioned'} />
                <span className="mt-0.5 block">
                  <Age days={ncr.days} late={30} />
                </span>
              </>
            }
          />
        ))}
      </Panel>
      <Panel
        title="Calibrations due"
        total={calibrations.total}
        unit="in 30 days"
        shown={calibrations.rows.length}
        all={{ to: '/instruments', label: 'All instruments' }}
        alert={calibrations.lapsed > 0 && <Late>{plural(calibrations.lapsed, 'calibration')} lapsed: files from these benches are refused</Late>}
        empty="No calibration falls due in the next 30 days."
      >
        {calibrations.rows.map((c) => (
          <PanelRow
            key={c.instrumentId}
            to={`/instruments/${c.instrumentId}`}
            title={c.code}
            detail={INSTRUMENT_KIND_LABELS[c.kind]}
            aside={
              <>
                <span className="block">{formatDate(c.dueOn)}</span>
                {c.daysLeft < 0 ? <Late>lapsed {plural(-c.daysLeft, 'day')} ago</Late> : c.daysLeft === 0 ? 'due today' : `in ${plural(c.daysLeft, 'day')}`}
              </>
            }
          />
        ))}
      </Panel>
      <Bars title="Open NCRs, by age" bars={section.ncrAges} unit="NCRs" />
    </SectionFrame>
  );
}

export function Purchasing({ section }: { section: PurchasingSection }) {
  const { rejected, openCorrective } = section;
  return (
    <SectionFrame title="Purchasing">
      <Panel
        title="Rejected lots, last 90 days"
        total={rejected.total}
        unit={rejected.total === 1 ? 'lot' : 'lots'}
        shown={rejected.rows.length}
        all={{ to: '/lots?state=rejected', label: 'All rejected lots' }}
        empty="No lot was rejected in the last 90 days."
      >
        {rejected.rows.map((lot) => (
          <PanelRow
            key={lot.lotId}
            to={`/lots/${lot.lotId}`}
            title={`${lotName(lot.lotId)} · ${lot.partNumber}`}
            detail={`${lot.supplier}, PO ${lot.purchaseOrder}${lot.yours ? ' (yours)' : ''}`}
            aside={
              <>
                <StateBadge state="rejected" label={lot.decision === 'sort' ? 'Rejected, sorting' : 'Rejected'} />
                <span className="mt-0.5 block">{formatDate(lot.signedOn)}</span>
              </>
            }
          />
        ))}
      </Panel>
      <Panel
        title="Open corrective actions"
        total={openCorrective.total}
        unit={openCorrective.total === 1 ? 'request' : 'requests'}
        shown={openCorrective.rows.length}
        all={{ to: '/corrective-actions', label: 'All corrective-action requests' }}
        alert={openCorrective.late > 0 && <Late>{plural(openCorrective.late, 'answer')} overdue from suppliers</Late>}
        empty="No corrective-action request is open."
      >
        {openCorrective.rows.map((car) => (
          <PanelRow
            key={car.id}
            to={`/corrective-actions/${car.id}`}
            title={`${car.number} · ${car.partNumber}`}
            detail={`${car.supplier}, answer due ${formatDate(car.responseDueOn)}`}
            aside={
              <>
                <StateBadge state={car.status} label={CAR_STATUS_LABELS[car.status]} tone={car.late ? 'fail' : 'info'} />
                <span className="mt-0.5 block">{car.late ? <Late>answer overdue</Late> : <>open {plural(car.days, 'day')}</>}</span>
              </>
            }
          />
        ))}
      </Panel>
      <Bars title="Rejected lots by supplier, last 90 days" bars={section.rejectedBySupplier} unit="lots" />
    </SectionFrame>
  );
}

export function Audit({ section }: { section: AuditSection }) {
  const { documents, chain } = section;
  return (
    <SectionFrame title="Audit">
      <Panel
        title="Recent documents"
        total={documents.total}
        unit="in 30 days"
        shown={documents.rows.length}
        all={{ to: '/certificates', label: 'All certificates and reports' }}
        empty="No document was issued in the last 30 days."
      >
        {documents.rows.map((d) => (
          <PanelRow
            key={d.id}
            to={`/lots/${d.lotId}`}
            title={d.number}
            detail={`${d.kind === 'certificate' ? 'Certificate of conformance' : 'Inspection report'}, lot ${lotName(d.lotId)}`}
            aside={
              <>
                {d.revoked && <StateBadge state="revoked" label="Revoked" tone="fail" />}
                <span className="block">{formatDateTime(d.issuedAt)}</span>
              </>
            }
          />
        ))}
      </Panel>
      <Panel title="Audit chain" total={Number(chain.length)} unit="entries" shown={1} empty="The audit trail is empty.">
        <PanelRow
          to="/audit"
          title={chain.tailIntact ? 'Newest entries intact' : 'Newest entries do not verify'}
          detail={`Last ${wholeNumber(chain.tailChecked)} links re-checked; last entry ${formatDateTime(chain.lastEntryAt)}`}
          aside={
            <StateBadge
              state={chain.tailIntact ? 'intact' : 'broken'}
              label={chain.tailIntact ? 'Intact' : 'Broken'}
              tone={chain.tailIntact ? 'pass' : 'fail'}
            />
          }
        />
      </Panel>
      <DailyColumns title="Documents issued per day, last 14 days" days={section.perDay} unit="documents" />
    </SectionFrame>
  );
}
