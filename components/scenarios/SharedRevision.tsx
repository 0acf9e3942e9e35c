"use client";
/**
 * What a colleague needs from a shared revision, read-only: the schematic, the step response and the loop gain
 * (simulated here, in the visitor's browser, in the simulation worker — the same run the workbench and the review
 * use), the headline figures and the checks. Nothing on this page can be edited.
 */
import { Schematic } from "@/components/schematic/Schematic";
import { WavePlot } from "@/components/traces/WavePlot";
import { useSimulation } from "@/components/traces/useSimulation";
import { ChecksTable } from "@/components/review/ChecksTable";
import { formatEng } from "@/lib/units/eng";
import type { ReactNode } from "react";
import { smallSignalWords } from "@/lib/design/words";

function Figure({ id, label, value }: { id: string; label: string; value: string }) {
  return (
    <div className="rounded border border-hairline bg-white px-3 py-2">
      <dt className="text-[12px] text-ink-muted">{label}</dt>
      <dd className="num text-lg font-semibold" data-testid={`shared-${id}`}>{value}</dd>
    </div>
  );
}

function Block({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section className="min-w-0 overflow-x-auto rounded border border-hairline bg-white p-4" aria-labelledby={`shared-h-${id}`} data-testid={`shared-section-${id}`}>
      <h2 id={`shared-h-${id}`} className="mb-2 text-base font-semibold">{title}</h2>
      {children}
    </section>
  );
}

export function SharedRevision({ body }: { body: unknown }) {
  const sim = useSimulation(body);
  const scenario = sim.scenario;
  const waiting = <p className="text-sm text-ink-muted">{sim.status === "running" ? "Simulating in your browser…" : "Not available."}</p>;
  const done = sim.status === "done" ? sim.sim : null;
  const loop = done?.loop ?? null;
  const m = done?.step.metrics ?? null;
  return (
    <div className="space-y-4" data-testid="shared-revision" data-sim-status={sim.status}>
      {sim.status === "error" && <p role="alert" className="text-sm text-verdict-fail">{sim.error}</p>}
      <Block id="schematic" title="Schematic">
        {scenario ? (
          <div className="overflow-x-auto">
            <Schematic scenario={scenario} selected={null} onSelect={() => undefined} op={done?.op ?? null} showOp={false} />
          </div>
        ) : waiting}
      </Block>
      <Block id="figures" title="Headline figures">
        {done ? (
          <dl className="grid grid-cols-2 gap-2 sm:grid-cols-4">
            <Figure id="phase-margin" label="Phase margin (current loop)" value={loop?.phaseMarginDeg == null ? "no crossover" : `${loop.phaseMarginDeg.toFixed(1)}°`} />
            <Figure id="crossover" label="Crossover" value={loop?.crossoverHz == null ? "—" : formatEng(loop.crossoverHz, "Hz")} />
            <Figure id="overshoot" label="Overshoot" value={m ? `${m.overshootPct.toFixed(1)} %${done?.step.small ? ` (${smallSignalWords(done.step.small)})` : ""}` : "—"} />
            <Figure id="settling" label="Settling (±1 %)" value={m?.settlingTime1pct == null ? "not settled" : formatEng(m.settlingTime1pct, "s")} />
          </dl>
        ) : waiting}
      </Block>
      <div className="grid gap-4 lg:grid-cols-2">
        <Block id="step" title="Step response">
          {done ? (
            <WavePlot testId="shared-step-plot" title="Load current" yUnit="A" width={520} markers={[{ t: done.step.stepTime, label: "step" }]}
              series={[
                { label: "Load current", time: done.step.time, values: done.step.iLoad, color: "#0072B2" },
                ...(done.step.small ? [{ label: "Small-signal step", time: done.step.small.time, values: done.step.small.iLoad, color: "#D55E00" }] : []),
              ]} />
          ) : waiting}
        </Block>
        <Block id="loop" title="Loop gain">
          {done && loop ? (
            <WavePlot testId="shared-loop-plot" title="Loop gain magnitude" yUnit="dB" xUnit="Hz" logX width={520}
              markers={loop.crossovers.map((f) => ({ t: f, label: f === loop.crossoverHz ? "crossover" : "0 dB" }))}
              series={[
                { label: "|T| current loop, dB", time: loop.freq, values: loop.magDb, color: "#0072B2" },
                ...(loop.loops.local ? [{ label: "|T| local op-amp loop, dB", time: loop.loops.local.freq, values: loop.loops.local.magDb, color: "#56B4E9" }] : []),
              ]} />
          ) : done ? <p className="text-sm text-ink-muted">Not available: {done.loopError}</p> : waiting}
        </Block>
      </div>
      <Block id="checks" title="Checks">
        {done ? <ChecksTable checks={done.checks} cautions={done.cautions} /> : waiting}
      </Block>
    </div>
  );
}
