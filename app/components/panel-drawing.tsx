// One panel of a plan drawn to scale, and the plan's set-ups as a list.
// Drawing convention: 1 SVG unit = 1 mm; x runs along the panel's length left to right, and the plan's
// y (upwards from the panel's lower edge, as the packing engine gives it) is flipped so y = 0 is at the
// bottom of the drawing: a rectangle at plan (x, y) with extent (l, w) is drawn at SVG (x, W − y − w).
import { useId, useState, type KeyboardEvent } from "react";
import type { Cut, Rect, Setup, SheetPlan } from "~/lib/packing/types";
import { inferTrim } from "~/lib/panel-look";
import { formatLength, formatSize, type DisplayUnit } from "~/lib/units";

export type PartLabel = {
  name: string;
  /** already formatted, e.g. "210 × 150 mm" */
  size: string;
  /** e.g. ["#1001 Ardent–Vasquez wedding · Table 7"] */
  origins: string[];
};

type PanelDrawingProps = {
  sheet: SheetPlan;
  /** by part id */
  labels: Record<string, PartLabel>;
  kerfMm: number;
  title: string;
  /** unit for offcut sizes; parts come formatted in their labels */
  unit?: DisplayUnit;
  /** edge trim of a trimmed panel, mm; when absent it is read off the plan (nothing lies inside it) */
  trimMm?: number;
};

// Text sizes are fractions of the drawing's length, so they land at the same screen size on every panel:
// at ~760 px across, 1/72 of the drawing is ~10.5 px. A 2440 mm panel then gets ~34 mm text, which fits a
// two-line label into a part of 100 mm.
const MIN_TEXT_FRACTION = 1 / 72;
const MAX_TEXT_SCALE = 1.7;
const CHAR_ADVANCE_EM = 0.56;
const LINE_HEIGHT_EM = 1.2;

const mmToUmRounded = (mm: number) => Math.round(mm * 1000);


/** wrapped: the lines are one name over two lines (not a name and a size) */
type TextLayout = { font: number; lines: string[]; upright: boolean; wrapped?: boolean };

/**
 * The largest readable label that fits the rectangle: run along its longer side, shrink to fit between
 * `min` and `max`, drop the second line when there is no room, shorten a long first line with "…",
 * and give up (no text) when even a few characters at the minimum size will not fit.
 */
function layoutText(lines: string[], along: number, across: number, min: number, max: number): TextLayout | null {
  const upright = across > along * 1.15;
  const [run, depth] = upright ? [across, along] : [along, across];
  const split = splitInTwo(lines[0]);
  const candidates = [...lines.map((_, i) => lines.slice(0, lines.length - i)), split];
  for (const shown of candidates) {
    if (shown.length === 0) continue;
    const longest = Math.max(...shown.map((line) => [...line].length));
    const byRun = (0.9 * run) / (longest * CHAR_ADVANCE_EM);
    const byDepth = (0.8 * depth) / (shown.length * LINE_HEIGHT_EM);
    const font = Math.min(max, byRun, byDepth);
    if (font >= min) return { font, lines: shown, upright, wrapped: shown === split };
  }
  if (depth * 0.8 < min * LINE_HEIGHT_EM) return null;
  const fitChars = Math.floor((0.9 * run) / (min * CHAR_ADVANCE_EM));
  if (fitChars < 4) return null;
  return { font: min, lines: [[...lines[0]].slice(0, fitChars - 1).join("") + "…"], upright };
}

/** A name of several words over two lines, split where the longer line is shortest; [] for one word. */
function splitInTwo(text: string): string[] {
  const words = text.split(/\s+/).filter(Boolean);
  if (words.length < 2) return [];
  let best: string[] = [];
  for (let i = 1; i < words.length; i++) {
    const pair = [words.slice(0, i).join(" "), words.slice(i).join(" ")];
    const worst = (lines: string[]) => Math.max(...lines.map((line) => [...line].length));
    if (best.length === 0 || worst(pair) < worst(best)) best = pair;
  }
  return best;
}

function RectText({ layout, cx, cy, className }: { layout: TextLayout; cx: number; cy: number; className: string }) {
  const { font, lines, upright, wrapped } = layout;
  const first = cy - ((lines.length - 1) * font * LINE_HEIGHT_EM) / 2 + 0.35 * font;
  return (
    <text
      x={cx}
      y={first}
      fontSize={font}
      textAnchor="middle"
      className={className}
      transform={upright ? `rotate(-90 ${cx} ${cy})` : undefined}
      pointerEvents="none"
    >
      {lines.map((line, i) => (
        <tspan key={i} x={cx} dy={i === 0 ? 0 : font * LINE_HEIGHT_EM} className={i > 0 && !wrapped ? "fill-muted" : undefined}>
          {line}
        </tspan>
      ))}
    </text>
  );
}

function cutLine(cut: Cut, kerfMm: number) {
  const centre = cut.at + kerfMm / 2;
  return cut.axis === "y"
    ? { x1: cut.from, y1: centre, x2: cut.to, y2: centre }
    : { x1: centre, y1: cut.from, x2: centre, y2: cut.to };
}

export function PanelDrawing({ sheet, labels, kerfMm, title, unit = "mm", trimMm }: PanelDrawingProps) {
  const [selected, setSelected] = useState<number | null>(null);
  const baseId = useId().replace(/[^a-zA-Z0-9_-]/g, "");
  const hatchId = `scrap-hatch-${baseId}`;
  const titleId = `panel-title-${baseId}`;

  const L = sheet.length;
  const W = sheet.width;
  const minText = (L * (1 + 2 * 0.03)) * MIN_TEXT_FRACTION;
  const pad = Math.max(minText * 1.1, L * 0.03);
  const trim = trimMm ?? inferTrim(sheet);
  const stroke = minText / 12;
  // Plan y (up from the lower edge) → SVG y (down from the top).
  const flipY = (y: number, height: number) => W - y - height;

  const labelOf = (partId: string, length: number, width: number): PartLabel =>
    labels[partId] ?? { name: partId, size: formatSize(mmToUmRounded(length), mmToUmRounded(width), unit), origins: [] };
  // each placed part with its label and drawing position, read by the part controls and the name layer
  const parts = sheet.placements.map((placement) => ({ placement, label: labelOf(placement.partId, placement.length, placement.width), y: flipY(placement.y, placement.width) }));
  const chosen = selected === null ? null : sheet.placements[selected];
  const chosenLabel = chosen ? labelOf(chosen.partId, chosen.length, chosen.width) : null;

  const choose = (index: number) => setSelected(index);
  const onKey = (index: number) => (event: KeyboardEvent) => {
    if (event.key === "Enter" || event.key === " ") {
      event.preventDefault();
      choose(index);
    }
  };

  const leftover = (rect: Rect, i: number, kind: "offcut" | "scrap") => {
    const y = flipY(rect.y, rect.width);
    const size = formatSize(mmToUmRounded(rect.length), mmToUmRounded(rect.width), unit);
    const layout = kind === "offcut" ? layoutText(["offcut", size], rect.length, rect.width, minText * 0.9, minText * 1.3) : null;
    return (
      <g key={`${kind}-${i}`} data-kind={kind}>
        <rect
          x={rect.x}
          y={y}
          width={rect.length}
          height={rect.width}
          className={kind === "offcut" ? "fill-rail-ink stroke-rail/40" : "stroke-muted/40"}
          fill={kind === "scrap" ? `url(#${hatchId})` : undefined}
          strokeWidth={stroke}
        >
          <title>{kind === "offcut" ? `offcut ${size}` : `scrap ${size}`}</title>
        </rect>
        {layout && <RectText layout={layout} cx={rect.x + rect.length / 2} cy={y + rect.width / 2} className="fill-rail" />}
      </g>
    );
  };

  return (
    <figure className="space-y-3">
      <svg
        role="group"
        aria-labelledby={titleId}
        viewBox={`${-pad} ${-pad} ${L + 2 * pad} ${W + 2 * pad}`}
        preserveAspectRatio="xMidYMid meet"
        width="100%"
        className="block h-auto w-full rounded-md bg-paper"
      >
        <title id={titleId}>{title}</title>
        <defs>
          {/* Scrap's look, shared with the printed sheet: lib/panel-look.ts. */}
          <pattern id={hatchId} patternUnits="userSpaceOnUse" width={minText * 0.7} height={minText * 0.7} patternTransform="rotate(45)">
            <rect width={minText * 0.7} height={minText * 0.7} className="fill-bad-soft" />
            <line x1={0} y1={0} x2={0} y2={minText * 0.7} className="stroke-bad/50" strokeWidth={minText * 0.12} />
          </pattern>
        </defs>

        {/* The panel, with its edge-trim margin as a faint band. */}
        <rect x={0} y={0} width={L} height={W} className="fill-line/50 stroke-rail" strokeWidth={stroke * 2} />
        <rect x={trim} y={trim} width={Math.max(0, L - 2 * trim)} height={Math.max(0, W - 2 * trim)} className="fill-card" />

        {sheet.offcuts.map((rect, i) => leftover(rect, i, "offcut"))}
        {sheet.scrap.map((rect, i) => leftover(rect, i, "scrap"))}

        {parts.map(({ placement, label, y }, index) => {
          const orders = label.origins.length ? `, for ${label.origins.join("; ")}` : "";
          const isChosen = selected === index;
          return (
            <g
              key={index}
              tabIndex={0}
              role="button"
              aria-label={`${label.name}, ${label.size}${orders}`}
              aria-pressed={isChosen}
              data-part={placement.partId}
              className="cursor-pointer outline-none [&:focus-visible>rect]:stroke-edge-dark"
              onClick={() => choose(index)}
              onFocus={() => choose(index)}
              onMouseEnter={() => choose(index)}
              onKeyDown={onKey(index)}
            >
              <rect
                x={placement.x}
                y={y}
                width={placement.length}
                height={placement.width}
                className={isChosen ? "fill-edge/35 stroke-edge-dark" : "fill-edge-soft stroke-edge"}
                strokeWidth={isChosen ? stroke * 3 : stroke}
              />
            </g>
          );
        })}
        {/* The parts' names drawn over them, apart from the controls: each part's own label says the same, with its orders. */}
        <g aria-hidden="true" pointerEvents="none">
          {parts.map(({ placement, label, y }, index) => {
            const layout = layoutText([label.name, label.size], placement.length, placement.width, minText, minText * MAX_TEXT_SCALE);
            return layout && <RectText key={index} layout={layout} cx={placement.x + placement.length / 2} cy={y + placement.width / 2} className="fill-ink" />;
          })}
        </g>

        {/* Cut lines at the kerf's centre, numbered in cutting order at their start. */}
        <g pointerEvents="none">
          {sheet.cuts.map((cut, i) => {
            const line = cutLine(cut, kerfMm);
            return (
              <line
                key={`cut-${i}`}
                x1={line.x1}
                y1={W - line.y1}
                x2={line.x2}
                y2={W - line.y2}
                className="stroke-rail"
                strokeWidth={Math.max(kerfMm, stroke * 2.5)}
                strokeLinecap="butt"
                opacity={0.85}
              />
            );
          })}
          {sheet.cuts.map((cut, i) => {
            const line = cutLine(cut, kerfMm);
            const r = minText * 0.8;
            return (
              <g key={`cut-number-${i}`} data-cut={i + 1}>
                <circle cx={line.x1} cy={W - line.y1} r={r} className="fill-rail stroke-card" strokeWidth={stroke} />
                <text x={line.x1} y={W - line.y1 + 0.35 * r} fontSize={r * 1.05} textAnchor="middle" className="fill-card font-semibold">
                  {i + 1}
                </text>
              </g>
            );
          })}
        </g>
      </svg>

      <figcaption aria-live="polite" className="rounded-md border border-line bg-card p-3 text-sm">
        {chosen && chosenLabel ? (
          <div>
            <p className="font-semibold text-ink">
              {chosenLabel.name} <span className="font-normal text-muted">{chosenLabel.size}</span>
            </p>
            {chosenLabel.origins.length ? (
              <ul className="mt-1 list-disc pl-5 text-ink">
                {chosenLabel.origins.map((origin, i) => (
                  <li key={i}>{origin}</li>
                ))}
              </ul>
            ) : (
              <p className="mt-1 text-muted">No orders recorded for this part.</p>
            )}
          </div>
        ) : (
          <p className="text-muted">Tap or hover over a part to see which orders it is for.</p>
        )}
      </figcaption>
    </figure>
  );
}

const SETUP_KIND: Record<Setup["kind"], string> = { breakdown: "Breakdown", rip: "Rip", crosscut: "Crosscut" };
const SETTING_NAME: Record<Setup["kind"], string> = { breakdown: "mark", rip: "fence", crosscut: "stop" };

/** The plan's set-ups in cutting order: one fence or stop setting each, with how many cuts it serves. */
export function SetupList({ setups, unit, ripMaxMm }: { setups: Setup[]; unit: DisplayUnit; /** the rip fence's widest setting: wider ones are flagged */ ripMaxMm?: number }) {
  if (setups.length === 0) return <p className="text-sm text-muted">No saw set-ups in this plan.</p>;
  return (
    <ol className="list-decimal space-y-1 pl-6 text-ink">
      {setups.map((setup, i) => (
        <li key={i} data-kind={setup.kind}>
          <span className="font-semibold">{SETUP_KIND[setup.kind]}</span>
          {" · "}
          {SETTING_NAME[setup.kind]} {formatLength(Math.round(setup.setting * 1000), unit)}
          {" · "}
          {setup.count} {setup.count === 1 ? "cut" : "cuts"}
          {setup.outsideStopRange && <span className="ml-2 text-warn">outside the stop block's range: cut to a marked line</span>}
          {setup.kind !== "crosscut" && ripMaxMm !== undefined && setup.setting > ripMaxMm && (
            <span className="ml-2 text-warn">wider than the rip fence allows: break down on another tool to a marked line</span>
          )}
        </li>
      ))}
    </ol>
  );
}
