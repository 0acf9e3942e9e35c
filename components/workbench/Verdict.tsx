"use client";
/**
 * The Verdict zone: headline figures with pass/warn/fail words, the checks table with formulas, and the cautions.
 * Verdict words always accompany the colour.
 */
import type { CheckRow, Verdict as VerdictWord } from "@/lib/design/checks";
import { explainFigures } from "@/lib/design/explain";
import {
  GAIN_MARGIN_PASS_DB, MODULUS_MARGIN_PASS, PHASE_MARGIN_PASS_DEG, PHASE_MARGIN_WARN_DEG, gainMarginVerdict, modulusMarginVerdict,
  judgedOvershootPct, judgedSettling, overshootVerdict, phaseMarginVerdict, settlingVerdict,
} from "@/lib/design/verdicts";
import { formatEng } from "@/lib/units/eng";
import type { LiveResult } from "@/lib/workbench/types";
import { useWb } from "./context";

const COLOR: Record<VerdictWord, string> = { pass: "text-verdict-pass", warn: "text-verdict-warn", fail: "text-verdict-fail" };
const BG: Record<VerdictWord, string> = { pass: "bg-verdict-pass/10", warn: "bg-verdict-warn/10", fail: "bg-verdict-fail/10" };

export function VerdictWordBadge({ v }: { v: VerdictWord | null }) {
  if (!v) return <span className="text-[11px] uppercase tracking-wide text-ink-muted">—</span>;
  return <span className={`rounded px-1.5 py-0.5 text-[11px] font-semibold uppercase tracking-wide ${COLOR[v]} ${BG[v]}`}>{v}</span>;
}

interface Headline {
  id: string;
  label: string;
  value: string;
  verdict: VerdictWord | null;
  hint: string;
}

/**
 * The headline figures. Stability figures are the current loop's (broken between the op-amp's output and the
 * base/gate resistor); the step figures are the large-signal step's, the load's real experience, but the overshoot
 * is the worse of it and the small-signal step's (a small command change rings as that one does).
 */
export function headlines(r: LiveResult | null, maxOvershootPct: number): Headline[] {
  const loop = r?.loop ?? null;
  const m = r?.step?.metrics ?? null;
  const small = r?.step?.small?.metrics ?? null;
  const row = (id: string): CheckRow | undefined => r?.checks.find((c) => c.id === id);
  const acc = row("accuracy");
  const diss = row("dissipation") ?? row("junction-temperature");
  const pm = loop?.phaseMarginDeg ?? null;
  const os = m ? m.overshootPct : null;
  const judgedOs = os === null ? null : judgedOvershootPct(os, r?.step?.small ?? null);
  const settle = m ? judgedSettling(m, r?.step?.small ?? null) : null;
  const nCross = loop?.crossovers.length ?? 0;
  return [
    {
      id: "phase-margin", label: "Phase margin (current loop)",
      value: pm === null ? (loop ? "no crossover" : "—") : `${pm.toFixed(1)}°`,
      verdict: phaseMarginVerdict(pm, loop?.unstable),
      hint: loop?.unstable
        ? "closed loop unstable: T(jω) encircles −1 (Nyquist)"
        : loop?.local?.phaseMarginDeg != null
        ? `local op-amp loop ${loop.local.phaseMarginDeg.toFixed(1)}°; pass ≥ ${PHASE_MARGIN_PASS_DEG}°`
        : `pass ≥ ${PHASE_MARGIN_PASS_DEG}°, warn ≥ ${PHASE_MARGIN_WARN_DEG}°`,
    },
    {
      id: "crossover", label: "Crossover",
      value: loop?.crossoverHz != null ? formatEng(loop.crossoverHz, "Hz") : "—",
      verdict: null,
      hint: nCross > 1
        ? `|T| = 1 at ${nCross} frequencies; shown: the one with the least margin`
        : "where the current loop's |T| = 1",
    },
    {
      id: "gain-margin", label: "Gain margin",
      value: loop ? (loop.gainMarginDb === null ? "no −180° crossing" : `${loop.gainMarginDb.toFixed(1)} dB`) : "—",
      verdict: gainMarginVerdict(loop?.gainMarginDb ?? null, loop?.unstable),
      hint: loop?.unstable ? "no margin: the closed loop is unstable" : `−|T| where ∠T = −180°; pass ≥ ${GAIN_MARGIN_PASS_DB} dB`,
    },
    {
      id: "modulus-margin", label: "Modulus margin",
      value: loop ? loop.modulusMargin.toFixed(2) : "—",
      verdict: modulusMarginVerdict(loop?.modulusMargin ?? null, loop?.unstable),
      hint: loop?.unstable ? "no margin: the closed loop is unstable" : loop ? `min |1 + T| at ${formatEng(loop.modulusMarginHz, "Hz")}; pass ≥ ${MODULUS_MARGIN_PASS}` : "min |1 + T|",
    },
    {
      // Judged, and shown, as the worse of this step and its small-signal twin (verdicts.ts judgedOvershootPct).
      id: "overshoot", label: "Overshoot",
      value: judgedOs === null ? "—" : Number.isFinite(judgedOs) ? `${judgedOs.toFixed(1)} %` : "grows",
      verdict: overshootVerdict(judgedOs, maxOvershootPct),
      hint: r?.step?.small?.grows
        ? `small-signal step grows: unstable; full step ${os!.toFixed(1)} %; target ≤ ${maxOvershootPct} %`
        : small && os !== null && small.overshootPct > os
        ? `small-signal step (the worse); full step ${os.toFixed(1)} %; target ≤ ${maxOvershootPct} %`
        : small ? `full step; small-signal ${small.overshootPct.toFixed(1)} %; target ≤ ${maxOvershootPct} %` : `target ≤ ${maxOvershootPct} %`,
    },
    {
      // Judged, and shown, as the slower of this step and its small-signal twin (verdicts.ts judgedSettling).
      id: "settling", label: "Settling (±1 %)",
      value: !settle ? "—" : settle.settlingTime1pct !== null ? formatEng(settle.settlingTime1pct, "s") : r?.step?.small?.grows ? "never (grows)" : "not within the record",
      verdict: settlingVerdict(settle),
      hint: `${settle?.small ? "small-signal step (the slower); " : ""}±0.1 %: ${settle?.settlingTime01pct != null ? formatEng(settle.settlingTime01pct, "s") : "not within the record"}`,
    },
    {
      id: "full-scale-error", label: "Full-scale error",
      value: acc ? `${acc.value.toFixed(2)} %` : "—",
      verdict: acc?.verdict ?? null,
      hint: acc ? `worst case; limit ${acc.limit.toFixed(2)} %` : "DC accuracy budget",
    },
    ...(r?.noise && r.noise.target !== null
      ? [{
        id: "noise", label: "Load-current noise",
        value: formatEng(r.noise.rms, "A"),
        verdict: row("noise")?.verdict ?? null,
        hint: `RMS ${formatEng(r.noise.band.low, "Hz")}–${formatEng(r.noise.band.high, "Hz")}; target ${formatEng(r.noise.target, "A")}`,
      }]
      : []),
    {
      // Templates without a pass device (the Howland pump) report the op-amp's junction temperature here instead.
      id: "dissipation", label: diss?.unit === "°C" ? "Hottest junction" : "Worst dissipation",
      value: diss ? formatEng(diss.value, diss.unit) : "—",
      verdict: diss?.verdict ?? null,
      hint: diss ? `rating ${formatEng(diss.limit, diss.unit)}` : "pass device",
    },
  ];
}

export function HeadlineFigures() {
  const current = useWb((s) => s.run.current);
  const maxOs = useWb((s) => s.scenario.studies.compensate.maxOvershootPct);
  const list = headlines(current, maxOs);
  return (
    <div className="grid grid-cols-2 gap-2" data-testid="headlines">
      {list.map((h) => (
        <div key={h.id} className="rounded border border-hairline bg-white px-3 py-2" data-testid={`metric-${h.id}`}>
          <div className="flex items-center justify-between gap-1">
            <span className="text-[12px] text-ink-muted">{h.label}</span>
            <VerdictWordBadge v={h.verdict} />
          </div>
          <div className="num mt-0.5 text-[22px] font-semibold leading-tight text-ink" data-testid={`metric-${h.id}-value`}>{h.value}</div>
          <div className="mt-0.5 text-[11px] leading-snug text-ink-muted">{h.hint}</div>
        </div>
      ))}
    </div>
  );
}

function fmtValue(c: CheckRow): string {
  if (c.unit === "" ) return c.value.toPrecision(3);
  if (c.unit === "% FS" || c.unit === "°C" || c.unit === "%") return `${c.value.toFixed(c.unit === "°C" ? 0 : 2)} ${c.unit}`;
  return formatEng(c.value, c.unit);
}

/** The value cell: a margin says so ("margin 300 mV"); the words may wrap, the quantity does not. */
function valueText(c: CheckRow) {
  return <>{c.valueKind === "margin" ? "margin " : ""}<span className="whitespace-nowrap">{fmtValue(c)}</span></>;
}

/** The limit cell: what the value needs ("needs ≥ 0 V", "needs ≤ 10.8 V"), or the limit as it is. */
function limitText(c: CheckRow) {
  const v = fmtValue({ ...c, value: c.limit });
  return <>{c.limitKind === "min" ? "needs ≥ " : c.limitKind === "max" ? "needs ≤ " : ""}<span className="whitespace-nowrap">{v}</span></>;
}

export function ChecksTable() {
  const checks = useWb((s) => s.run.current?.checks ?? null);
  if (!checks) return <p className="text-[13px] text-ink-muted">Checks appear after the first run.</p>;
  return (
    <table className="w-full border-collapse text-[12px]" data-testid="checks-table">
      <caption className="sr-only">Design checks</caption>
      <thead>
        <tr className="border-b border-hairline text-left text-ink-muted">
          <th scope="col" className="py-1 pr-2 font-medium">Check</th>
          <th scope="col" className="py-1 pr-2 text-right font-medium">Value</th>
          <th scope="col" className="py-1 pr-2 text-right font-medium">Needs</th>
          <th scope="col" className="py-1 font-medium">Verdict</th>
        </tr>
      </thead>
      <tbody>
        {checks.map((c) => (
          <tr key={c.id} className="border-b border-hairline align-top" data-testid={`check-${c.id}`}>
            <td className="py-1 pr-2">
              <details>
                <summary className="cursor-pointer">{c.label}</summary>
                <p className="num mt-1 text-[11px] text-ink">{c.formula}</p>
                <p className="mt-0.5 text-[11px] text-ink-muted">{c.detail}</p>
              </details>
            </td>
            <td className="num py-1 pr-2 text-right" data-testid={`check-${c.id}-value`}>{valueText(c)}</td>
            <td className="num py-1 pr-2 text-right text-ink-muted" data-testid={`check-${c.id}-limit`}>{limitText(c)}</td>
            <td className="py-1"><VerdictWordBadge v={c.verdict} /></td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function CautionsList() {
  const cautions = useWb((s) => s.run.current?.cautions ?? null);
  if (!cautions || cautions.length === 0) {
    return <p className="text-[12px] text-ink-muted">No cautions for this scenario. Local codes and licensed practice still apply.</p>;
  }
  return (
    <ul className="space-y-2" data-testid="cautions">
      {cautions.map((c) => (
        <li key={c.id} className="rounded border border-verdict-warn/40 bg-verdict-warn/5 px-3 py-2 text-[12px]">
          <p className="font-semibold text-verdict-warn">Caution: {c.title}</p>
          <p className="mt-0.5 text-ink">{c.text}</p>
        </li>
      ))}
    </ul>
  );
}

/**
 * When the figures could be read as disagreeing — several 0 dB crossings, a local loop with less margin than the
 * current loop, a large-signal step unlike the linearised one — say what was measured (lib/design/explain.ts).
 */
export function VerdictNote() {
  const current = useWb((s) => s.run.current);
  const scenario = useWb((s) => s.scenario);
  const step = current?.step ?? null;
  const notes = explainFigures(scenario, current?.loop ?? null, current?.loop?.local ?? null, step);
  if (notes.length === 0) return null;
  return (
    <div role="note" className="space-y-1 rounded border border-hairline bg-white px-3 py-2 text-[12px] leading-snug text-ink" data-testid="verdict-note">
      <p className="font-semibold">Why the figures disagree</p>
      {notes.map((n) => <p key={n}>{n}</p>)}
    </div>
  );
}
