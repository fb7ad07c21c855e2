import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useExportJobs, usePartOptions, useSupplierOptions } from '../api';
import { ExportForm } from '../components/ExportForm';
import { ExportJobCard } from '../components/ExportJobCard';

export function ExportsPage() {
  const jobs = useExportJobs();
  const suppliers = useSupplierOptions();
  const parts = usePartOptions();
  const supplierName = (id?: number) => suppliers.data?.data.find((s) => s.id === id)?.name;
  const partNumber = (id?: number) => parts.data?.data.find((p) => p.id === id)?.number;
  return (
    <div className="max-w-5xl">
      <PageHeader
        title="Exports"
        subtitle="One ZIP per request: the PDF of every certificate and inspection report issued in the range, index.csv, the audit trail of their lots and manifest.sha256 to check every file."
      />
      <ExportForm />
      <h2 className="mt-6 mb-2">Your recent exports</h2>
      {jobs.error && <Notice tone="error">{jobs.error.message}</Notice>}
      {jobs.data?.data.length === 0 && <p className="text-ink-muted">No exports yet.</p>}
      <ul className="space-y-2">
        {jobs.data?.data.map((job) => (
          <ExportJobCard key={job.id} job={job} names={{ supplier: supplierName(job.filter.supplierId), part: partNumber(job.filter.partId) }} />
        ))}
      </ul>
    </div>
  );
}
