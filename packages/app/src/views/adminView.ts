import type { AuditEntry } from '../api/types.ts';
import { formatDate } from './projectsView.ts';

export interface AuditRow {
  readonly id: number;
  readonly at: string;
  readonly actor: string;
  readonly action: string;
  readonly object: string;
  readonly ip: string;
  readonly detail: string;
}

export interface AuditFilter {
  readonly text: string;
  readonly action: string;
  readonly objectType: string;
}

export function auditRows(entries: readonly AuditEntry[]): AuditRow[] {
  return entries.map((e) => ({
    id: e.id,
    at: formatDate(e.at),
    actor: e.actorEmail ?? 'system',
    action: e.action,
    object: e.objectId ? `${e.objectType} ${e.objectId}` : e.objectType,
    ip: e.ip ?? '',
    detail: e.detail === null || e.detail === undefined ? '' : typeof e.detail === 'string' ? e.detail : JSON.stringify(e.detail),
  }));
}

/** Rows matching every filter that is set; text matches actor, object and detail. */
export function filterAudit(rows: readonly AuditRow[], filter: AuditFilter): AuditRow[] {
  const text = filter.text.trim().toLowerCase();
  return rows.filter(
    (r) =>
      (!filter.action || r.action === filter.action) &&
      (!filter.objectType || r.object.startsWith(filter.objectType)) &&
      (!text || `${r.actor} ${r.object} ${r.detail}`.toLowerCase().includes(text)),
  );
}

export function distinct(values: readonly string[]): string[] {
  return [...new Set(values)].sort();
}
