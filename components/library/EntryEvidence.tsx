"use client";
/** What the lead judges an entry by: the simulation's checks and the bench traces measured against it. */
import { useSimulation } from "@/components/traces/useSimulation";
import { BenchComparison, type TraceMeta } from "@/components/traces/BenchComparison";
import { ComparisonTable, type ComparisonRowView } from "@/components/traces/ComparisonTable";
import { WavePlot } from "@/components/traces/WavePlot";
import { ChecksTable } from "@/components/review/ChecksTable";
import type { Tolerances } from "@/lib/traces/compare";

export function EntryEvidence(props: {
  body: unknown;
  traces: TraceMeta[];
  tolerances: Tolerances;
  submitted: { traceId: string; verdict: "pass" | "warn" | "fail"; rows: ComparisonRowView[] }[];
}) {
  const sim = useSimulation(props.body);
  return (
    <div className="space-y-6">
      <section className="rounded border border-hairline bg-white p-4">
        <h2 className="mb-2 font-semibold">Measured against simulated</h2>
        {props.submitted.map((c) => (
          <div key={c.traceId} className="mb-4">
            <p className="mb-1 text-sm text-ink-muted">As submitted: {props.traces.find((t) => t.id === c.traceId)?.label ?? "trace"}</p>
            <ComparisonTable rows={c.rows} verdict={c.verdict} testId="submitted-comparison" />
          </div>
        ))}
        {sim.status === "running" && <p role="status" className="text-sm text-ink-muted">Simulating…</p>}
        {sim.status === "error" && <p role="alert" className="text-sm text-verdict-fail">{sim.error}</p>}
        {sim.status === "done" && (props.traces.length ? (
          <>
            <p className="mb-1 text-sm text-ink-muted">Recomputed here, with the tolerances the team had at submission:</p>
            <BenchComparison traces={props.traces} step={sim.sim.step} tolerances={props.tolerances} />
          </>
        ) : <p className="text-sm text-ink-muted">The evidence traces are no longer stored.</p>)}
      </section>
      {sim.status === "done" && (
        <section className="rounded border border-hairline bg-white p-4">
          <h2 className="mb-2 font-semibold">Simulation and checks</h2>
          <WavePlot title="Simulated load current" yUnit="A" series={[{ label: "Load current", time: sim.sim.step.time, values: sim.sim.step.iLoad, color: "#0072B2" }]} markers={[{ t: sim.sim.step.stepTime, label: "step" }]} />
          <div className="mt-3"><ChecksTable checks={sim.sim.checks} cautions={sim.sim.cautions} /></div>
        </section>
      )}
    </div>
  );
}
