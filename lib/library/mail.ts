import "server-only";
/** The library's mails: who hears of a change, what they read, and delivery that never undoes the change. */
import { sendMail, type OutgoingMail } from "@/lib/mail/transport";
import { publicBaseUrl } from "@/lib/shared/tokens";
import type { CurrentUser } from "@/lib/shared/roles";
import type { Recipient } from "@/lib/db/library";

export function libraryMail(p: { to: Recipient; subject: string; lines: string[]; entryId: string }): OutgoingMail {
  const link = `${publicBaseUrl()}/library/${p.entryId}`;
  const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
  return {
    to: p.to.email,
    subject: p.subject,
    text: `Hello ${p.to.name},\n\n${p.lines.join("\n\n")}\n\nOpen the entry: ${link}\n`,
    html: `<div style="font-family:system-ui,sans-serif;color:#1C2430"><p>Hello ${esc(p.to.name)},</p>${p.lines
      .map((l) => `<p>${esc(l)}</p>`)
      .join("")}<p><a href="${esc(link)}" style="color:#0F766E">Open the entry</a></p></div>`,
  };
}

/** Sends each mail; a mail that cannot be sent is logged and reported, the recorded change stands. */
export async function deliver(mails: OutgoingMail[]): Promise<string[]> {
  const failed: string[] = [];
  for (const m of mails) {
    try {
      await sendMail(m);
    } catch (e) {
      console.error("[library] mail to", m.to, "failed:", (e as Error).message);
      failed.push(m.to);
    }
  }
  return failed;
}

export function others(list: Recipient[], actor: CurrentUser): Recipient[] {
  const seen = new Set<string>();
  return list.filter((r) => r.email !== actor.email && !seen.has(r.email) && seen.add(r.email));
}
