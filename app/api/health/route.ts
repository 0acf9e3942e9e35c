import { NextResponse } from "next/server";
import { databaseUp } from "@/lib/db/knex";
import { mailUp } from "@/lib/mail/transport";

export const dynamic = "force-dynamic";

/** Liveness of the app and what it depends on: 200 when all is up, 503 naming what is down. */
export async function GET() {
  const [database, mail] = await Promise.all([databaseUp(), mailUp()]);
  const body = {
    status: database && mail ? "ok" : "degraded",
    database: database ? "up" : "down",
    mail: mail ? "up" : "down",
  };
  return NextResponse.json(body, { status: database && mail ? 200 : 503, headers: { "cache-control": "no-store" } });
}
