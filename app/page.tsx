import Link from "next/link";
import { HealthBadge } from "@/components/shell/HealthBadge";

export default function HomePage() {
  return (
    <main className="mx-auto max-w-4xl px-6 py-12">
      <h1 className="text-3xl font-semibold tracking-tight">Current sources that behave on the bench</h1>
      <p className="mt-4 max-w-2xl text-ink-muted">
        Quell takes an op-amp, a pass transistor and a sense resistor past the textbook I = V·k/R: headroom and
        compliance at the heaviest load, worst-case dissipation and junction temperature, the DC accuracy budget, and
        loop stability with real coils, cables and capacitance — then review, sharing and a library of designs the
        team has measured.
      </p>
      <div className="mt-8 flex gap-3">
        <Link href="/scenarios" className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark">
          Open scenarios
        </Link>
      </div>
      <div className="mt-12 rounded border border-hairline bg-white p-4">
        <HealthBadge />
      </div>
    </main>
  );
}
