import type { IconName } from '@/components/ui/icon';
import type { StatusTone } from '@/components/ui/status-badge';
import { BAND_LABELS } from '@/shared/thermal/bands';
import type { FlagKind } from '@/shared/thermal/evaluate';
import { SEVERITY_WORDS, type Severity } from '@/shared/thermal/severity';
import type { EscalationSent } from '@/shared/types/bedside';
import { clockTime } from './board-format';

const KIND_LOOK: Record<FlagKind, { label: string; icon: IconName }> = {
  gap: { label: 'Probe and remote site apart', icon: 'thermometer' },
  'overdue-check': { label: 'Check overdue', icon: 'clock' },
  'heat-stress': { label: 'Heat stress', icon: 'flame' },
  'cold-stress': { label: 'Cold stress', icon: 'snow' },
  'manual-mode': { label: 'Manual mode beyond its limit', icon: 'hand' },
  'skin-to-skin-deviation': { label: 'Skin-to-skin deviation', icon: 'hands' },
  fever: { label: 'Fever (38.0 °C or over)', icon: 'flame' },
};

/** Colour follows severity (shared/thermal/severity.ts), never the view: critical and urgent red, a caution amber. */
const SEVERITY_TONE: Record<Severity, StatusTone> = { critical: 'danger', urgent: 'danger', caution: 'warning' };

/**
 * What a flag badge shows: the severity's word, the kind (or band) and direction, its icon and
 * colour. `short` (a wall tile, read from across the room) leaves out a threshold the word implies.
 */
export function flagLook(flag: { kind: FlagKind; severity?: Severity; detail?: Record<string, unknown> }, short = false): { tone: StatusTone; icon: IconName; label: string } {
  const severity = flag.severity ?? 'urgent';
  const d = flag.detail ?? {};
  let what = short && flag.kind === 'fever' ? 'Fever' : KIND_LOOK[flag.kind].label;
  if (flag.kind === 'cold-stress' && typeof d.band === 'string' && d.band in BAND_LABELS) what = BAND_LABELS[d.band as keyof typeof BAND_LABELS];
  if (flag.kind === 'gap' && d.direction === 'probe-lower') what = `${what}: probe lower`;
  if (flag.kind === 'gap' && d.direction === 'probe-higher') what = `${what}: remote site lower`;
  if (flag.kind === 'skin-to-skin-deviation' && typeof d.deviationCenti === 'number') what = `${what}: ${d.deviationCenti < 0 ? 'colder' : 'warmer'} than the reference`;
  return { tone: SEVERITY_TONE[severity], icon: severity === 'critical' ? 'alert' : KIND_LOOK[flag.kind].icon, label: `${SEVERITY_WORDS[severity]}: ${what}` };
}

/** "Told Marta Lindqvist at 10:05 by e-mail", only for an escalation that went out; null otherwise. */
export function escalationLine(e: EscalationSent | null | undefined, timeZone: string, clock: '24h' | '12h', withSeverity = false): string | null {
  if (!e) return null;
  const who = e.to.map((r) => r.name ?? r.email).join(', ') || 'the unit address';
  const sev = withSeverity && e.severity ? ` (${SEVERITY_WORDS[e.severity]})` : '';
  const seen = e.acknowledgedAt ? `; acknowledged by ${e.acknowledgedBy?.name ?? 'the charge nurse'} at ${clockTime(e.acknowledgedAt, timeZone, clock)}` : '';
  return `Told ${who} at ${clockTime(e.sentAt, timeZone, clock)} by e-mail${sev}${seen}`;
}

/**
 * Every escalation of a flag, oldest first: one line each when it escalated again after
 * worsening (each naming its severity), else the one line.
 */
export function escalationLines(e: EscalationSent | null | undefined, timeZone: string, clock: '24h' | '12h'): string[] {
  if (!e) return [];
  const all = [...(e.earlier ?? []), e];
  return all.map((x) => escalationLine(x, timeZone, clock, all.length > 1)!);
}
