import Image from "next/image";
import Link from "next/link";
import { currentUser } from "@/lib/auth/current";

export const dynamic = "force-dynamic";

/** What Quell does, with a picture of the workbench (a screenshot of our own UI, public/workbench.png). */
export default async function HomePage() {
  const user = await currentUser().catch(() => null);
  return (
    <main className="mx-auto max-w-6xl px-4 py-10 sm:px-6">
      <div className="max-w-3xl">
        <h1 className="text-3xl font-semibold tracking-tight">Current sources that behave on the bench</h1>
        <p className="mt-4 text-ink-muted">
          Quell takes an op-amp, a pass transistor and a sense resistor past the textbook I = V·k/R: headroom and
          compliance at the heaviest load, worst-case dissipation and junction temperature, the DC accuracy budget, and
          loop stability with real coils, cables and capacitance — then review, sharing and a library of designs the
          team has measured.
        </p>
        <p className="mt-3 text-ink-muted">
          Pick a template, type part values, and watch the step response, the loop gain and the checks follow every
          edit; the simulation runs in your browser.
        </p>
        <div className="mt-6 flex flex-wrap gap-3">
          {user ? (
            <Link href="/scenarios" className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark">Open your scenarios</Link>
          ) : (
            <>
              <Link href="/sign-up" className="rounded bg-signal px-4 py-2 text-sm font-medium text-white hover:bg-signal-dark">Create a team</Link>
              <Link href="/sign-in" className="rounded border border-hairline bg-white px-4 py-2 text-sm font-medium text-ink hover:border-signal">Sign in</Link>
            </>
          )}
        </div>
      </div>
      <figure className="mt-10">
        <Image src="/workbench.png" alt="The Quell workbench: the schematic and part values on the left, the step response and loop gain in the middle, the headline figures and checks on the right" width={1440} height={900} priority unoptimized className="h-auto w-full rounded border border-hairline bg-white shadow-sm" />
        <figcaption className="mt-2 text-sm text-ink-muted">The workbench with the valve-coil demo: a 47 pF compensation capacitor leaves the current loop ringing, and the checks say so.</figcaption>
      </figure>
    </main>
  );
}
