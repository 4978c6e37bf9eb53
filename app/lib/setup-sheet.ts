// Everything a batch's saw set-up sheet shows, derived from the batch, its chosen plan and the shop's
// settings. Pure: the PDF module only lays these out. Plan lengths are millimetres (the engine's
// interface); they become integer micrometres here and are formatted in the shop's unit.
import type { Cut, Placement, Plan, Setup, SheetPlan } from "./packing/types";
import { formatDay } from "./dates";
import { countOf } from "./plural";
import { fiveCut, formatErrorRate, formatFine, formatKerf, sledWarning, STALE_AFTER_DAYS, type SledWarning } from "./sled";
import { stockName } from "./stock-names";
import { formatLength, formatMillimetres, formatSize, type DisplayUnit } from "./units";

export type SheetPart = { name: string; lengthUm: number; widthUm: number; origins: { orderNumber: number; customerName: string; productName: string; text: string | null }[] };
export type SheetStockRef = { kind: "panel" | "offcut"; id: string };
export type SheetOffcut = { id: string; lengthUm: number; widthUm: number; location: string };
export type SheetSled = {
  name: string;
  stopMinUm: number;
  stopMaxUm: number;
  widestUm: number;
  lastCheck: { checkedAt: Date; widthFirstEndUm: number; widthSecondEndUm: number; stripLengthUm: number; pivotDistanceUm: number } | null;
};

export type SetupSheetInput = {
  /** cutOn: the day a batch already cut was cut ("10 Nov 2026"); its sheet then shows the saw and sled as they stood that day */
  batch: { code: string; materialName: string; thicknessUm: number; cutOn?: string | null };
  shop: { name: string; timeZone?: string; displayUnit: DisplayUnit; sledToleranceUmPerM: number; ripMaxUm: number; sledWidthMaxUm: number; stopMinUm: number; stopMaxUm: number };
  plan: { number: number; kerfMm: number; plan: Plan; stockRefs: Record<string, SheetStockRef> };
  /** by the plan's part id */
  parts: Record<string, SheetPart>;
  /** racked offcuts reserved for the batch, by offcut id */
  offcuts: Record<string, SheetOffcut>;
  saw: { name: string; latestKerfUm: number | null } | null;
  sled: SheetSled | null;
  now: Date;
};

const WHEN_CUT: Record<Extract<SledWarning, { warn: true }>["reason"], string> = {
  "no-sled": "No sled was recorded for this plan when the batch was cut.",
  "no-check": "The sled had no squareness check on record when this batch was cut.",
  stale: `The sled's last squareness check was more than ${STALE_AFTER_DAYS} days old when this batch was cut.`,
  "out-of-tolerance": "The sled was out of the shop's tolerance for this batch's longest crosscut when it was cut.",
};

export type SetupRow = {
  /** 1-based, in cutting order (the plan's setups array) */
  number: number;
  kind: Setup["kind"];
  /** "Rip · fence 153.2 mm" */
  heading: string;
  setting: string;
  count: number;
  /** which panels and cut numbers: "panel 1: cuts 2, 3 · panel 2: cut 4" */
  where: string;
  /** crosscuts: the parts cut to length at this stop; rips and breakdowns: the parts they cut loose; with their orders */
  parts: { label: string; count: number; orders: string }[];
  /** what to do instead when a machine limit is passed; never empty when a limit is passed */
  flags: string[];
  /** safety notes for this setting (push stick / push block) */
  notes: string[];
};

export type PanelView = {
  number: number;
  title: string;
  sheet: SheetPlan;
  /** by part id: the name printed on the drawing */
  labels: Record<string, string>;
  breakdown: string[];
  offcutsToRack: string[];
};

export type SetupSheet = {
  unit: DisplayUnit;
  title: string;
  subtitle: string;
  pull: string[];
  kerf: string;
  saw: string;
  sled: string;
  sledCheck: string[];
  warning: string | null;
  panels: PanelView[];
  setups: SetupRow[];
  offcutsToRack: string[];
  unplaced: string[];
  cautions: string[];
};

const um = (mm: number) => Math.round(mm * 1000);
const EPS_UM = 2;
const PUSH_STICK_UM = 150_000;
const PUSH_BLOCK_UM = 50_000;

/**
 * A figure on the sheet: mm to 0.1, or inches to the nearest 1/32. A rounded inch figure says so
 * ("≈") and gives the exact millimetres beside it, so the sawyer knows what the plan really wants.
 */
export function sheetLength(lengthUm: number, unit: DisplayUnit): string {
  const text = formatLength(lengthUm, unit);
  return unit === "in" && text.startsWith("≈") ? `${text} (${formatMillimetres(lengthUm)} mm)` : text;
}

/** "2440 × 1220 mm"; inch sizes with a rounded side give each side in full ("≈ 48-1/32 in (1220 mm) × …"). */
export function sheetSize(lengthUm: number, widthUm: number, unit: DisplayUnit): string {
  const rounded = unit === "in" && [lengthUm, widthUm].some((x) => formatLength(x, "in").startsWith("≈"));
  return rounded ? `${sheetLength(lengthUm, unit)} × ${sheetLength(widthUm, unit)}` : formatSize(lengthUm, widthUm, unit);
}

// The cautions posted at the saw. Sources (TRADE-FACTS §3): OSHA 29 CFR 1910.213 and its Woodworking
// eTool (guard, spreader, push sticks), UK HSE WIS16 and the HSE rip-saw page (riving knife, push
// sticks, kickback), table-saw manufacturers' standard warning text (push stick under 150 mm, push
// block under 50 mm; no rip fence as a length stop), and woodworking-magazine safety articles
// (stop block ahead of the blade so the offcut is free).
export const CAUTIONS = [
  "Blade guard and riving knife fitted and set for every cut; the guard down to the work.",
  "Push stick when the fence is closer than 150 mm to the blade; push block under 50 mm. Never hands near the blade.",
  "Stand out of the line of kickback, to the side of the blade, never behind it.",
  "Never use the rip fence as a length stop when crosscutting. Set the length with a stop block on the sled's fence before the blade, and leave the offcut free.",
  "Hold the piece between stop and blade firmly; never reach for offcuts while the blade turns.",
  "The saw maker's manual and your local rules come first; where they differ from this sheet, follow them.",
];

export const PARTS_LEAD: Record<Setup["kind"], string> = { crosscut: "cuts to length", rip: "cuts loose", breakdown: "cuts loose" };

function cutsMatching(sheet: SheetPlan, setup: Setup) {
  const target = um(setup.setting);
  return sheet.cuts.map((cut, i) => ({ cut, number: i + 1 })).filter(({ cut }) => cut.kind === setup.kind && um(cut.setting) === target);
}

function near(a: number, b: number) {
  return Math.abs(um(a) - um(b)) <= EPS_UM;
}

/**
 * Which cut frees each part of a panel: the last cut beside the part whose line spans exactly the
 * part's side (the piece is then the part alone, plus waste on the far side). Every part is freed by
 * one cut, so each set-up can say which parts — and whose orders — come off at its setting.
 */
/** Parts a crosscut cuts to length: on its low side (the keeper, between stop and blade), as long as the setting, within the cut's span. */
function partsSizedBy(cut: Cut, placements: Placement[]): number[] {
  const found: number[] = [];
  placements.forEach((p, i) => {
    const [lo, extent, across, acrossExtent] = cut.axis === "x" ? [p.x, p.length, p.y, p.width] : [p.y, p.width, p.x, p.length];
    if (across < cut.from - 0.001 || across + acrossExtent > cut.to + 0.001) return;
    if (near(extent, cut.setting) && near(lo + extent, cut.at)) found.push(i);
  });
  return found;
}

export function freeingCuts(sheet: SheetPlan, kerfMm: number): Map<number, number> {
  const freed = new Map<number, number>();
  sheet.cuts.forEach((cut, c) => {
    sheet.placements.forEach((p, i) => {
      const [lo, extent, along, alongExtent] = cut.axis === "x" ? [p.x, p.length, p.y, p.width] : [p.y, p.width, p.x, p.length];
      if (!near(along, cut.from) || !near(along + alongExtent, cut.to)) return;
      if (near(lo + extent, cut.at) || near(lo, cut.at + kerfMm)) freed.set(i, c);
    });
  });
  return freed;
}

function list(numbers: number[]) {
  return numbers.length === 1 ? `cut ${numbers[0]}` : `cuts ${numbers.join(", ")}`;
}

/** "#1001 Ardent–Vasquez wedding (3), #1002 …"; the counts only when this set-up makes every copy. */
function summariseOrders(origins: SheetPart["origins"], count: number): string {
  const byOrder = new Map<number, { customer: string; n: number }>();
  for (const o of origins) {
    const e = byOrder.get(o.orderNumber);
    if (e) e.n++;
    else byOrder.set(o.orderNumber, { customer: o.customerName, n: 1 });
  }
  return [...byOrder.entries()].map(([n, e]) => (count === origins.length ? `#${n} ${e.customer} (${e.n})` : `#${n} ${e.customer}`)).join(", ");
}

const KIND_NAME: Record<Setup["kind"], string> = { breakdown: "Breakdown", rip: "Rip", crosscut: "Crosscut" };
const SETTING_NAME: Record<Setup["kind"], string> = { breakdown: "mark", rip: "fence", crosscut: "stop" };

export function buildSetupSheet(input: SetupSheetInput): SetupSheet {
  const { batch, shop, plan, parts, offcuts, saw, sled, now } = input;
  const unit = shop.displayUnit;
  const len = (lengthUm: number) => sheetLength(lengthUm, unit);
  const size = (l: number, w: number) => sheetSize(l, w, unit);
  const sheets = plan.plan.sheets;
  const kerfMm = plan.kerfMm;

  // Pull list: stock panels grouped by size, racked offcuts one by one with their rack place.
  const fullSheets = new Map<string, number[]>();
  const pullOffcuts: string[] = [];
  sheets.forEach((sheet, i) => {
    const ref = plan.stockRefs[sheet.stockId];
    const s = size(um(sheet.length), um(sheet.width));
    if (ref?.kind === "offcut") {
      const rack = offcuts[ref.id];
      pullOffcuts.push(`Racked offcut ${s} from ${rack?.location ? rack.location : "the rack (no place recorded)"} — panel ${i + 1}`);
    } else fullSheets.set(s, [...(fullSheets.get(s) ?? []), i + 1]);
  });
  const pull = [
    ...[...fullSheets.entries()].map(([s, numbers]) => `${numbers.length} × ${stockName("panel", s)} — ${numbers.length === 1 ? "panel" : "panels"} ${numbers.join(", ")}`),
    ...pullOffcuts,
  ];

  const labelFor = (partId: string) => parts[partId]?.name ?? partId;
  const panels: PanelView[] = sheets.map((sheet, i) => {
    const ref = plan.stockRefs[sheet.stockId];
    const labels: Record<string, string> = {};
    for (const p of sheet.placements) labels[p.partId] = labelFor(p.partId);
    return {
      number: i + 1,
      title: `Panel ${i + 1} of ${sheets.length}: ${stockName(ref?.kind, size(um(sheet.length), um(sheet.width)))}`,
      sheet,
      labels,
      breakdown: sheet.cuts.map((cut, c) => ({ cut, n: c + 1 })).filter(({ cut }) => cut.kind === "breakdown").map(({ cut, n }) => `Cut ${n}: mark at ${len(um(cut.setting))} from the edge`),
      offcutsToRack: sheet.offcuts.map((o) => size(um(o.length), um(o.width))),
    };
  });

  const stopMin = sled?.stopMinUm ?? shop.stopMinUm;
  const stopMax = sled?.stopMaxUm ?? shop.stopMaxUm;
  const widest = Math.min(sled?.widestUm ?? shop.sledWidthMaxUm, shop.sledWidthMaxUm);
  let longestCrosscutUm = 0;
  const freeing = sheets.map((sheet) => freeingCuts(sheet, kerfMm));

  const setups: SetupRow[] = plan.plan.setups.map((setup, i) => {
    const settingUm = um(setup.setting);
    const setting = len(settingUm);
    const where: string[] = [];
    const freed = new Map<string, number>();
    let widestLineUm = 0;
    sheets.forEach((sheet, s) => {
      const matches = cutsMatching(sheet, setup);
      if (!matches.length) return;
      where.push(`panel ${s + 1}: ${list(matches.map((m) => m.number))}`);
      const mine = new Set(matches.map((m) => m.number - 1));
      for (const { cut } of matches) widestLineUm = Math.max(widestLineUm, um(cut.to - cut.from));
      // A stop lists the parts it cuts to length; a fence or mark the parts it cuts loose.
      const parts = new Set<number>();
      if (setup.kind === "crosscut") for (const { cut } of matches) for (const p of partsSizedBy(cut, sheet.placements)) parts.add(p);
      else for (const [p, c] of freeing[s]) if (mine.has(c)) parts.add(p);
      for (const p of parts) {
        const id = sheet.placements[p].partId;
        freed.set(id, (freed.get(id) ?? 0) + 1);
      }
    });
    if (setup.kind === "crosscut") longestCrosscutUm = Math.max(longestCrosscutUm, widestLineUm);

    const flags: string[] = [];
    const notes: string[] = [];
    if (setup.kind === "crosscut") {
      if (setup.outsideStopRange || settingUm < stopMin || settingUm > stopMax) {
        flags.push(`Outside the stop block's range (${len(stopMin)} to ${len(stopMax)}): do not set the stop. Mark the length on each piece and cut to the line.`);
      }
      if (widestLineUm > widest) flags.push(`The piece is ${len(widestLineUm)} across, wider than the sled takes (${len(widest)}): break it down on another tool (track saw or panel saw) to a marked line.`);
    } else {
      if (settingUm > shop.ripMaxUm) flags.push(`Wider than the rip fence allows (${len(shop.ripMaxUm)}): break down on another tool (track saw or panel saw) to a marked line.`);
      if (setup.kind === "rip" && settingUm < PUSH_BLOCK_UM) notes.push("Fence under 50 mm from the blade: use a push block.");
      else if (setup.kind === "rip" && settingUm < PUSH_STICK_UM) notes.push("Fence under 150 mm from the blade: use a push stick.");
    }

    return {
      number: i + 1,
      kind: setup.kind,
      heading: `${KIND_NAME[setup.kind]} · ${SETTING_NAME[setup.kind]} ${setting}`,
      setting,
      count: setup.count,
      where: where.join(" · "),
      parts: [...freed.entries()].map(([id, count]) => {
        const part = parts[id];
        return { label: part ? `${part.name} ${size(part.lengthUm, part.widthUm)}` : id, count, orders: part ? summariseOrders(part.origins, count) : "" };
      }),
      flags,
      notes,
    };
  });

  // The sled's last check against this batch's longest crosscut.
  const check = sled?.lastCheck ? { ...sled.lastCheck, ...fiveCut(sled.lastCheck) } : null;
  const warning: SledWarning = sledWarning(check ? { checkedAt: check.checkedAt, errorUmPerM: check.errorUmPerM } : null, shop.sledToleranceUmPerM, longestCrosscutUm, now, Boolean(sled));
  const sledCheck: string[] = [];
  const cutOn = batch.cutOn ?? null;
  if (check) {
    const day = formatDay(check.checkedAt.toISOString(), shop.timeZone);
    const age = warning.ageDays === undefined ? "" : ` (${countOf(warning.ageDays, "day")} ${cutOn ? "before the cut" : "ago"})`;
    sledCheck.push(`Last five-cut check ${day}${age}: error ${formatErrorRate(check.errorUmPerM, unit)}.`);
    if (longestCrosscutUm > 0 && warning.errorOverLengthUm !== undefined && warning.allowedUm !== undefined) {
      sledCheck.push(`Over this batch's longest crosscut (${len(longestCrosscutUm)}): ${formatFine(warning.errorOverLengthUm, unit)}; the shop allows ${formatFine(warning.allowedUm, unit)}.`);
    }
  } else if (sled) sledCheck.push("No squareness check recorded for this sled.");

  const sawKerf = saw?.latestKerfUm ?? null;
  const kerfUm = um(kerfMm);
  const kerf =
    sawKerf !== null && Math.abs(sawKerf - kerfUm) > 50
      ? `${formatKerf(kerfUm, unit)} assumed by the plan; ${saw!.name}'s latest test cut measured ${formatKerf(sawKerf, unit)}: check the blade before cutting.`
      : `${formatKerf(kerfUm, unit)} assumed by the plan${sawKerf !== null ? ` (${saw!.name}'s latest test cut)` : ""}.`;

  return {
    unit,
    title: `${batch.code} · set-up sheet`,
    subtitle: `${batch.materialName}, ${len(batch.thicknessUm)} thick · plan ${plan.number} · ${sheets.length} ${sheets.length === 1 ? "panel" : "panels"} · ${setups.length} set-ups · ${shop.name}${cutOn ? ` · cut ${cutOn}, shown as it stood that day` : ""}`,
    pull,
    kerf,
    saw: saw ? `Saw: ${saw.name}` : "Saw: none chosen in the plan settings.",
    sled: sled ? `Sled: ${sled.name} · stop block ${len(sled.stopMinUm)} to ${len(sled.stopMaxUm)} from the cut line · widest piece ${len(sled.widestUm)}` : "Sled: none chosen in the plan settings.",
    sledCheck,
    // A reprint of a cut batch tells what stood that day, not what to do before cutting it.
    warning: warning.warn ? (cutOn ? WHEN_CUT[warning.reason] : warning.message) : null,
    panels,
    setups,
    offcutsToRack: panels.flatMap((p) => p.offcutsToRack.map((s) => `${s} — from panel ${p.number}`)),
    unplaced: plan.plan.unplaced.map((u) => `${u.quantity} × ${labelFor(u.partId)}: ${u.reason}`),
    cautions: CAUTIONS,
  };
}
