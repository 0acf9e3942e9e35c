import type { OutgoingMail } from "./transport";

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function html(paragraphs: string[], link: string, label: string): string {
  return `<div style="font-family:system-ui,sans-serif;color:#1C2430">${paragraphs
    .map((p) => `<p>${escapeHtml(p)}</p>`)
    .join("")}<p><a href="${escapeHtml(link)}" style="color:#0F766E">${escapeHtml(label)}</a></p></div>`;
}

/** The invitation e-mail: who invited, to which team, in which role, and the expiring link. */
export function invitationMail(p: { to: string; teamName: string; inviterName: string; role: string; link: string; expiresAt: Date }): OutgoingMail {
  const lines = [
    `${p.inviterName} invites you to join ${p.teamName} on Quell as ${p.role === "lead" ? "a lead" : `a ${p.role}`}.`,
    `The link works until ${p.expiresAt.toUTCString()}.`,
  ];
  return {
    to: p.to,
    subject: `Join ${p.teamName} on Quell`,
    text: `${lines.join("\n\n")}\n\nAccept the invitation: ${p.link}\n\nIf you did not expect this, ignore this message.\n`,
    html: html([...lines, "If you did not expect this, ignore this message."], p.link, "Accept the invitation"),
  };
}

/** The password-reset e-mail: a single-use link that expires. */
export function passwordResetMail(p: { to: string; link: string; expiresAt: Date }): OutgoingMail {
  const lines = [
    "Someone asked to reset the password of your Quell account.",
    `The link below works once, until ${p.expiresAt.toUTCString()}.`,
  ];
  return {
    to: p.to,
    subject: "Reset your Quell password",
    text: `${lines.join("\n\n")}\n\nChoose a new password: ${p.link}\n\nIf it was not you, ignore this message; your password stays as it is.\n`,
    html: html([...lines, "If it was not you, ignore this message; your password stays as it is."], p.link, "Choose a new password"),
  };
}
