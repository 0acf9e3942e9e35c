/**
 * Local SMTP fake for development and tests: accepts every message on 127.0.0.1 and stores it in the
 * dev_mailbox table, where leads read it on /dev/outbox. Never used in production.
 */
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";
import knexFactory from "knex";
import config from "../knexfile";

const port = Number(process.env.QUELL_SMTP_PORT ?? 2525);
const host = process.env.QUELL_SMTP_HOST ?? "127.0.0.1";
const db = knexFactory(config);

function addresses(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return "";
  const list = Array.isArray(a) ? a : [a];
  return list.flatMap((x) => x.value.map((v) => v.address ?? "")).filter(Boolean).join(", ");
}

const server = new SMTPServer({
  secure: false,
  disabledCommands: ["STARTTLS", "AUTH"],
  authOptional: true,
  logger: false,
  size: 5 * 1024 * 1024,
  onData(stream, _session, callback) {
    simpleParser(stream)
      .then(async (mail) => {
        await db("dev_mailbox").insert({
          to_address: addresses(mail.to),
          from_address: addresses(mail.from),
          subject: mail.subject ?? "",
          text_body: mail.text ?? "",
          html_body: typeof mail.html === "string" ? mail.html : "",
        });
        callback();
      })
      .catch((err: Error) => {
        console.error("[mail] could not store a message:", err.message);
        callback(err);
      });
  },
});

server.on("error", (err) => console.error("[mail] smtp error:", err.message));
server.listen(port, host, () => console.log(`[mail] SMTP fake listening on ${host}:${port}`));

// Close gracefully, but never linger: an idle SMTP client must not keep the fake alive after Ctrl-C.
const stop = () => {
  setTimeout(() => process.exit(0), 1000).unref();
  server.close(() => void db.destroy().finally(() => process.exit(0)));
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
