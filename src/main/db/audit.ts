/**
 * The audit log: who changed what, when, from which values to which. Rows are only ever added.
 * `record` joins the caller's transaction, so a change and its audit row commit together.
 *
 * Exported API:
 *   interface AuditEntry { id; atMs; who; action; entity; entityId; oldJson; newJson; reason }
 *   interface NewAuditEntry { who; action; entity; entityId; old?; new?; reason? }
 *   interface AuditQuery { entity?; entityId?; who?; action?; fromMs?; toMs?; limit? }
 *   class AuditLog(fdb: FieldDb)
 *     record(entry: NewAuditEntry): number          the new row's id
 *     forEntity(entity, entityId): AuditEntry[]     oldest first
 *     list(query?: AuditQuery): AuditEntry[]        newest first; times inclusive; default limit 1000
 */
import type Database from 'better-sqlite3';
import { InputError } from '../../shared/errors.js';
import { requireText } from './checks.js';
import type { FieldDb } from './database.js';

export interface AuditEntry {
  id: number;
  atMs: number;
  who: string;
  /** create, edit, delete, resolve, interrupt, … */
  action: string;
  /** reading, well, reservoir, conflict, import, … */
  entity: string;
  entityId: number;
  /** JSON of the row before the change (null for a creation). */
  oldJson: string | null;
  /** JSON of the row after the change. */
  newJson: string | null;
  reason: string;
}

export interface NewAuditEntry {
  who: string;
  action: string;
  entity: string;
  entityId: number;
  /** Serialised with JSON.stringify; omit for none. */
  old?: unknown;
  new?: unknown;
  reason?: string;
}

export interface AuditQuery {
  entity?: string;
  entityId?: number;
  who?: string;
  action?: string;
  fromMs?: number;
  toMs?: number;
  limit?: number;
}

interface AuditRow {
  id: number;
  at_ms: number;
  who: string;
  action: string;
  entity: string;
  entity_id: number;
  old_json: string | null;
  new_json: string | null;
  reason: string;
}

const DEFAULT_LIMIT = 1000;

export class AuditLog {
  private readonly now: () => number;
  private readonly insert: Database.Statement;
  private readonly byEntity: Database.Statement<[string, number], AuditRow>;
  private readonly query: Database.Statement<[Record<string, unknown>], AuditRow>;

  constructor(fdb: FieldDb) {
    this.now = fdb.now;
    this.insert = fdb.db.prepare(
      `INSERT INTO audit_log (at_ms, who, action, entity, entity_id, old_json, new_json, reason)
       VALUES (@at_ms, @who, @action, @entity, @entity_id, @old_json, @new_json, @reason)`,
    );
    this.byEntity = fdb.db.prepare('SELECT * FROM audit_log WHERE entity = ? AND entity_id = ? ORDER BY id');
    this.query = fdb.db.prepare(
      `SELECT * FROM audit_log
        WHERE (@entity IS NULL OR entity = @entity)
          AND (@entity_id IS NULL OR entity_id = @entity_id)
          AND (@who IS NULL OR who = @who)
          AND (@action IS NULL OR action = @action)
          AND (@from_ms IS NULL OR at_ms >= @from_ms)
          AND (@to_ms IS NULL OR at_ms <= @to_ms)
        ORDER BY at_ms DESC, id DESC
        LIMIT @limit`,
    );
  }

  record(entry: NewAuditEntry): number {
    const result = this.insert.run({
      at_ms: this.now(),
      who: requireText(entry.who, 'who'),
      action: requireText(entry.action, 'action'),
      entity: requireText(entry.entity, 'entity'),
      entity_id: entry.entityId,
      old_json: entry.old === undefined ? null : JSON.stringify(entry.old),
      new_json: entry.new === undefined ? null : JSON.stringify(entry.new),
      reason: entry.reason ?? '',
    });
    return Number(result.lastInsertRowid);
  }

  forEntity(entity: string, entityId: number): AuditEntry[] {
    return this.byEntity.all(entity, entityId).map(toEntry);
  }

  list(query: AuditQuery = {}): AuditEntry[] {
    const limit = query.limit ?? DEFAULT_LIMIT;
    if (!Number.isSafeInteger(limit) || limit <= 0) throw new InputError(`must be a positive whole number (got ${limit})`, { field: 'limit' });
    return this.query
      .all({
        entity: query.entity ?? null,
        entity_id: query.entityId ?? null,
        who: query.who ?? null,
        action: query.action ?? null,
        from_ms: query.fromMs ?? null,
        to_ms: query.toMs ?? null,
        limit,
      })
      .map(toEntry);
  }
}

function toEntry(r: AuditRow): AuditEntry {
  return {
    id: r.id,
    atMs: r.at_ms,
    who: r.who,
    action: r.action,
    entity: r.entity,
    entityId: r.entity_id,
    oldJson: r.old_json,
    newJson: r.new_json,
    reason: r.reason,
  };
}
