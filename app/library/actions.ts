"use server";
import { z } from "zod";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { validatedAction } from "@/lib/auth/action";
import { setTeamTolerances } from "@/lib/library/tolerances";
import { startFromEntry } from "@/lib/library/workflow";
import { storedText } from "@/lib/shared/text";

const num = (label: string) => z.coerce.number({ error: `${label} must be a number` }).finite(`${label} must be a number`).positive(`${label} must be above zero`).max(1000, `${label}: at most 1000`);

/** "Start from this": a new scenario from a validated entry, then straight to it (designers and leads). */
export const startFromEntryAction = validatedAction(
  z.object({ entryId: z.string().uuid("entryId must be a library entry id"), title: storedText("title").max(200, "title: at most 200 characters").optional() }),
  async (data, user) => {
    const { scenarioId } = await startFromEntry(user, data.entryId, data.title);
    revalidatePath("/scenarios");
    redirect(`/scenarios/${scenarioId}`);
  },
  { role: "designer" },
);

/** The team's tolerances for the measured-vs-simulated verdict (leads). */
export const setTolerancesAction = validatedAction(
  z.object({
    riseTimePct: num("Rise time tolerance"),
    overshootPts: num("Overshoot tolerance"),
    settlingTimePct: num("Settling time tolerance"),
    ringingPct: num("Ringing frequency tolerance"),
    rmsPctOfStep: num("RMS difference tolerance"),
    settleBandPct: num("Settling band").max(50, "Settling band: at most 50 %"),
  }),
  async (data, user) => {
    await setTeamTolerances(user, data);
    revalidatePath("/library");
    return { ok: true, message: "Tolerances saved." };
  },
  { role: "lead" },
);
