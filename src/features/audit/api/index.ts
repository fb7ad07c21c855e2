import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AuditAnchor, AuditAnchorCheck, AuditChainHead, AuditChainReport, AuditChoicesView, AuditEventView } from '@shared/schemas/audit';
import type { VerificationResult } from '@shared/schemas/certificates';
import type { ExportFilter, ExportJobView, ExportSpanQuery, ExportSpanView } from '@shared/schemas/exports';
import type { ListResponse } from '@shared/schemas/paging';
import { api } from '@/lib/api';
import { listPage } from '@/lib/lists';

export type Query = Record<string, string | number | undefined>;

export type IssuedDocument = {
  id: number;
  number: string;
  kind: 'certificate' | 'inspection-report';
  dataHash: string;
  pdfSha256: string;
  issuedAt: string;
  revokedAt: string | null;
  lot: { id: number; supplierLot: string };
  part: { id: number; number: string; description: string };
  supplier: { id: number; name: string };
  decision: 'accept' | 'reject' | 'use-as-is';
  signer: string;
};

type SupplierOption = { id: number; name: string };
type PartOption = { id: number; number: string; description: string };

export const auditKeys = {
  all: ['audit'] as const,
  documents: (query: Query) => [...auditKeys.all, 'documents', query] as const,
  events: (query: Query) => [...auditKeys.all, 'events', query] as const,
  head: () => [...auditKeys.all, 'chain-head'] as const,
  choices: () => [...auditKeys.all, 'choices'] as const,
  exports: () => [...auditKeys.all, 'exports'] as const,
  exportJob: (id: number) => [...auditKeys.all, 'exports', id] as const,
  exportSpan: (query: ExportSpanQuery) => [...auditKeys.all, 'export-span', query] as const,
  suppliers: () => [...auditKeys.all, 'supplier-options'] as const,
  parts: () => [...auditKeys.all, 'part-options'] as const,
  verification: (number: string, hash: string) => ['verification', number, hash] as const,
};

export const useDocuments = (query: Query) =>
  useQuery({
    queryKey: auditKeys.documents(query),
    queryFn: () => api<ListResponse<IssuedDocument>>('/certificates', { query }),
    placeholderData: keepPreviousData,
  });

export const useAuditEvents = (query: Query) =>
  useQuery({ queryKey: auditKeys.events(query), queryFn: listPage<AuditEventView>('/audit', query), placeholderData: keepPreviousData });

/** The record types on the trail and the users by name, for the trail's filter lists. */
export const useAuditChoices = () => useQuery({ queryKey: auditKeys.choices(), queryFn: () => api<AuditChoicesView>('/audit/choices') });

export function useVerifyChain() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<AuditChainReport>('/audit/verify'),
    // The report carries the head it checked up to: show that one, not an older reading.
    onSuccess: (report) => queryClient.setQueryData(auditKeys.head(), report.head),
  });
}

export const useChainHead = () => useQuery({ queryKey: auditKeys.head(), queryFn: () => api<AuditChainHead>('/audit/head') });

export const useCheckAnchor = () => useMutation({ mutationFn: (anchor: AuditAnchor) => api<AuditAnchorCheck>('/audit/anchor', { query: anchor }) });

export const useExportJobs = () => useQuery({ queryKey: auditKeys.exports(), queryFn: () => api<ListResponse<ExportJobView>>('/exports') });

const unfinished = (job?: ExportJobView) => job?.status === 'queued' || job?.status === 'running';

/** One job, polled while it is still being built. */
export const useExportJob = (job: ExportJobView) =>
  useQuery({
    queryKey: auditKeys.exportJob(job.id),
    queryFn: () => api<ExportJobView>(`/exports/${job.id}`),
    initialData: job,
    refetchInterval: (query) => (unfinished(query.state.data) ? 500 : false),
  });

/** The documents a choice finds: how many, and the first and last day they were issued on. */
export const useExportSpan = (query: ExportSpanQuery) =>
  useQuery({ queryKey: auditKeys.exportSpan(query), queryFn: () => api<ExportSpanView>('/exports/span', { query }), placeholderData: keepPreviousData });

export function useStartExport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (filter: ExportFilter) => api<ExportJobView>('/exports', { body: filter }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKeys.exports() }),
  });
}

export const useSupplierOptions = () =>
  useQuery({ queryKey: auditKeys.suppliers(), queryFn: () => api<ListResponse<SupplierOption>>('/suppliers', { query: { pageSize: 500, sort: 'name' } }) });

export const usePartOptions = () =>
  useQuery({ queryKey: auditKeys.parts(), queryFn: () => api<ListResponse<PartOption>>('/parts', { query: { pageSize: 500, sort: 'number' } }) });

export const useVerification = (number: string, hash: string) =>
  useQuery({
    queryKey: auditKeys.verification(number, hash),
    queryFn: () => api<VerificationResult>('/certificates/verify', { query: { number, hash } }),
    enabled: Boolean(number && hash),
    retry: false,
  });
