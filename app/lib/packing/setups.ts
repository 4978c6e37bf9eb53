// Saw set-ups from the cuts of a batch: one fence or stop setting serves every cut of that size.
import type { CutKind, MachineLimits, Setup } from "./types";
import { umToMm } from "./units";

const KIND_ORDER: Record<CutKind, number> = { breakdown: 0, rip: 1, crosscut: 2 };

/**
 * Settings in cutting order: breakdown, then rips, then crosscuts; within each kind the
 * largest first, so the fence and the stop block travel one way. Settings are in µm.
 */
export function deriveSetups(cuts: { kind: CutKind; setting: number }[], limits?: MachineLimits): Setup[] {
  const m = new Map<string, { kind: CutKind; setting: number; count: number }>();
  for (const c of cuts) {
    const k = c.kind + ":" + c.setting;
    const e = m.get(k);
    if (e) e.count++;
    else m.set(k, { kind: c.kind, setting: c.setting, count: 1 });
  }
  const list = [...m.values()].sort((a, b) => KIND_ORDER[a.kind] - KIND_ORDER[b.kind] || b.setting - a.setting);
  return list.map((e) => {
    const setting = umToMm(e.setting);
    const s: Setup = { kind: e.kind, setting, count: e.count };
    if (
      e.kind === "crosscut" &&
      ((limits?.stopMin !== undefined && setting < limits.stopMin) || (limits?.stopMax !== undefined && setting > limits.stopMax))
    ) {
      s.outsideStopRange = true;
    }
    return s;
  });
}
