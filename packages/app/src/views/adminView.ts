import type { AuditEntry } from '../api/types.ts';
import { formatDate } from './projectsView.ts';
import { humanise, labelOf } from '../lib/messages.ts';

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

/** "release Mains sync PI loop v3": the object by the name the server resolved, else its type and id. */
function objectText(e: AuditEntry): string {
  if (!e.objectId) return e.objectType;
  return e.objectLabel ? `${e.objectType} ${e.objectLabel}` : `${e.objectType} ${e.objectId}`;
}

function valueText(v: unknown): string {
  if (v === null || v === undefined) return '—';
  if (typeof v === 'string') return v;
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (Array.isArray(v)) return v.map(valueText).join(', ');
  return Object.entries(v as Record<string, unknown>).map(([k, inner]) => `${humanise(k).toLowerCase()} ${valueText(inner)}`).join(', ');
}

/** A change as "label: old → new"; spec paths by the form's labels ("NCO centre frequency: 50 → 60"). */
function changeText(label: string, change: { from?: unknown; to?: unknown }): string {
  return `${label}: ${valueText(change.from)} → ${valueText(change.to)}`;
}

const isChange = (v: unknown): v is { from: unknown; to: unknown } => typeof v === 'object' && v !== null && 'from' in v && 'to' in v;

/** An entry's detail in words, one "label value" part per member, not raw JSON. */
export function detailText(detail: unknown): string {
  if (detail === null || detail === undefined) return '';
  if (typeof detail !== 'object' || Array.isArray(detail)) return valueText(detail);
  const parts: string[] = [];
  for (const [key, value] of Object.entries(detail as Record<string, unknown>)) {
    if (key === 'specChanges' && Array.isArray(value)) {
      parts.push(...(value as { field: string; from: unknown; to: unknown }[]).map((c) => changeText(labelOf(c.field).label, c)));
      if (value.length === 0) parts.push('spec unchanged');
    } else if (isChange(value)) {
      parts.push(changeText(humanise(key), value));
    } else {
      parts.push(`${humanise(key)}: ${valueText(value)}`);
    }
  }
  return parts.join('; ');
}

export function auditRows(entries: readonly AuditEntry[]): AuditRow[] {
  return entries.map((e) => ({
    id: e.id,
    at: formatDate(e.at),
    actor: e.actorEmail ?? 'system',
    action: e.action,
    object: objectText(e),
    ip: e.ip ?? '',
    detail: detailText(e.detail),
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
