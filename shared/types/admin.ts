import type { UnitWithSettings } from './board';
import type { Role } from '../roles';

export interface AdminUser {
  id: string;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  unitIds: string[];
  /** 'active': has a password; 'invited': an invitation is waiting; 'deactivated'. */
  status: 'active' | 'invited' | 'deactivated';
  inviteExpiresAt: string | null;
  /** When the person last signed in (a session started), or null if never. */
  lastSignInAt?: string | null;
  /** False when the person also works in a unit the signed-in administrator does not administer. */
  manageable: boolean;
}

export interface AdminBed {
  id: string;
  label: string;
  active: boolean;
}

export interface AdminUnit extends UnitWithSettings {
  beds: AdminBed[];
}

export interface UploadRowPreview {
  /** The line in the file (the header is line 1). */
  line: number;
  values: Record<string, string>;
  errors: string[];
  /** What importing would do with this row. */
  action: 'create' | 'skip' | 'error';
  /** Why a row is skipped (already present). */
  note?: string;
  /** Readings: values outside their usual range; the row imports only when its line is confirmed. */
  unusual?: string[];
}

export interface UploadPreview {
  upload: { id: string; kind: 'roster' | 'readings'; filename: string; sha256: string; rowCount: number; status: 'previewed' | 'imported' | 'rejected' };
  /** A file with the same content was imported before: importing again changes nothing. */
  alreadyImported: boolean;
  rows: UploadRowPreview[];
  errorCount: number;
  toCreate: number;
  /** Readings: lines to create whose values need the charge nurse's confirmation, one by one. */
  toConfirm?: number[];
}

export interface ImportResult {
  created: number;
  skipped: number;
  alreadyImported: boolean;
}

/** One entry of the administrator's audit-log viewer; before and after never hold secrets. */
export interface AuditEntry {
  id: number;
  at: string;
  actorId: string | null;
  actorName: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  unitId: string | null;
  unitName: string | null;
  before: unknown;
  after: unknown;
}

export interface AuditPage {
  events: AuditEntry[];
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: number | null;
}
