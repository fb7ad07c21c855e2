import type { OutboxMailRecord } from '../../mail/outbox';

export const presentOutboxMail = (m: OutboxMailRecord) => ({
  id: m.id,
  recipients: m.recipients,
  subject: m.subject,
  status: m.status,
  attempts: m.attempts,
  nextAttemptAt: m.status === 'queued' ? m.nextAttemptAt.toISOString() : null,
  lastError: m.lastError,
  sentAt: m.sentAt?.toISOString() ?? null,
  createdAt: m.createdAt.toISOString(),
  related: m.relatedType ? { type: m.relatedType, id: m.relatedId } : null,
});
