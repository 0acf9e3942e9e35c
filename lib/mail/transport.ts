import nodemailer, { type Transporter } from "nodemailer";

/** SMTP settings: the local fake in development and tests; a real relay through the same variables in production. */
export function mailSettings() {
  return {
    host: process.env.QUELL_SMTP_HOST ?? "127.0.0.1",
    port: Number(process.env.QUELL_SMTP_PORT ?? 2525),
    from: process.env.QUELL_MAIL_FROM ?? "Quell <quell@localhost>",
  };
}

export function transport(): Transporter {
  const s = mailSettings();
  return nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 3000,
    greetingTimeout: 3000,
  });
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export async function sendMail(m: OutgoingMail): Promise<void> {
  const t = transport();
  try {
    await t.sendMail({ from: mailSettings().from, ...m });
  } finally {
    t.close();
  }
}

/** True when the SMTP server answers its greeting. */
export async function mailUp(): Promise<boolean> {
  const t = transport();
  try {
    return await t.verify();
  } catch {
    return false;
  } finally {
    t.close();
  }
}
