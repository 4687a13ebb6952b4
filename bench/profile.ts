/** Summarise a V8 .cpuprofile: self time per function, so the README can say where the time goes. */
import fs from 'node:fs';
import path from 'node:path';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
}

export interface HotSpot {
  fn: string;
  where: string;
  selfPct: number;
}

export function summariseProfile(dir: string, top = 15): HotSpot[] {
  const file = fs.readdirSync(dir).find((f) => f.endsWith('.cpuprofile'));
  if (!file) return [];
  const profile = JSON.parse(fs.readFileSync(path.join(dir, file), 'utf8')) as { nodes: ProfileNode[]; samples: number[] };
  const hits = new Map<number, number>();
  for (const s of profile.samples) hits.set(s, (hits.get(s) ?? 0) + 1);
  const total = profile.samples.length || 1;
  const byFn = new Map<string, HotSpot>();
  for (const n of profile.nodes) {
    const count = hits.get(n.id) ?? 0;
    if (!count) continue;
    const url = n.callFrame.url.replace(/^file:\/\//, '');
    // Paths relative to the project, so nothing machine-specific ends up in the README.
    const rel = url ? path.relative(process.cwd(), url) : '';
    const where = rel ? `${rel}:${n.callFrame.lineNumber + 1}` : '(native)';
    const key = `${n.callFrame.functionName}@${where}`;
    const spot = byFn.get(key) ?? { fn: n.callFrame.functionName || '(anonymous)', where, selfPct: 0 };
    spot.selfPct += (100 * count) / total;
    byFn.set(key, spot);
  }
  return [...byFn.values()].sort((a, b) => b.selfPct - a.selfPct).slice(0, top);
}
