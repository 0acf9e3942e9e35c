/**
 * Reading a bench-trace upload (multipart form) on the server: the size limit while streaming, the form fields
 * checked with zod, then the CSV parsed. Every failure comes back as a status and a message naming the field or
 * the line; nothing is stored by this module.
 */
import { z } from "zod";
import { readLimitedBytes } from "./body";
import { controlCharacterMessage, hasControlCharacters, storedText } from "@/lib/shared/text";
import { describeProblems, MAX_TRACE_BYTES, MAX_TRACE_CHANNELS, parseTraceCsv, TraceParseError, type ParsedTrace, type TraceProblem } from "@/lib/traces/parse";

/** Largest multipart request, bytes: the file limit plus room for the other fields. */
export const MAX_UPLOAD_BYTES = MAX_TRACE_BYTES + 64 * 1024;

const scale = z.number({ error: "scale must be a number" }).finite("scale must be finite").refine((x) => x !== 0, "scale must not be zero");

/** Parsing options the upload form sends as JSON in the `options` field. */
export const traceOptionsSchema = z.object({
  timeUnit: z.enum(["s", "ms", "µs", "us", "ns"], { error: "timeUnit must be s, ms, µs or ns" }).optional(),
  channels: z
    .array(
      z.object({
        name: storedText("name").trim().max(60).optional(),
        sourceUnit: z.enum(["V", "mV", "µV", "uV", "A", "mA", "µA", "uA"], { error: "sourceUnit must be V, mV, µV, A, mA or µA" }).optional(),
        scale: scale.optional(),
        unit: z.enum(["V", "A"], { error: "unit must be V or A" }).optional(),
      }),
    )
    .max(MAX_TRACE_CHANNELS)
    .optional(),
});
export type TraceOptions = z.infer<typeof traceOptionsSchema>;

/** Instrument settings as the user entered them (free text and numbers, kept with the trace). */
export const traceSettingsSchema = z
  .record(storedText("key").max(60), z.union([storedText("value").max(500), z.number().finite(), z.boolean(), z.null()]))
  .refine((r) => Object.keys(r).length <= 30, "settings: at most 30 entries");

export type TraceUpload =
  | {
      ok: true;
      label: string;
      fileName: string;
      revisionId: string | null;
      options: TraceOptions;
      settings: Record<string, string | number | boolean | null>;
      parsed: ParsedTrace;
    }
  | { ok: false; status: 400 | 413; error: string; problems?: TraceProblem[]; fieldErrors?: Record<string, string[]> };

function jsonField<T>(form: FormData, name: string, schema: z.ZodType<T>, fallback: T): { ok: true; value: T } | { ok: false; errors: string[] } {
  const raw = form.get(name);
  if (raw === null || raw === "") return { ok: true, value: fallback };
  if (typeof raw !== "string") return { ok: false, errors: [`${name} must be text (JSON)`] };
  let data: unknown;
  try {
    data = JSON.parse(raw);
  } catch {
    return { ok: false, errors: [`${name} is not valid JSON`] };
  }
  const r = schema.safeParse(data);
  if (!r.success) return { ok: false, errors: r.error.issues.map((i) => `${[name, ...i.path.map(String)].join(".")}: ${i.message}`) };
  return { ok: true, value: r.data };
}

/** Reads and checks a multipart trace upload; parses the CSV. Does not store anything. */
export async function readTraceUpload(req: Request, maxBytes = MAX_UPLOAD_BYTES): Promise<TraceUpload> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    return { ok: false, status: 400, error: "Send the trace as multipart/form-data with a `file` field." };
  }
  const bytes = await readLimitedBytes(req, maxBytes);
  if (!bytes) return { ok: false, status: 413, error: `The upload is over ${(maxBytes / 1048576).toFixed(0)} MB.` };
  let form: FormData;
  try {
    form = await new Response(bytes as BodyInit, { headers: { "content-type": type } }).formData();
  } catch {
    return { ok: false, status: 400, error: "The multipart body could not be read." };
  }
  const file = form.get("file");
  const fieldErrors: Record<string, string[]> = {};
  if (!file || typeof file === "string") fieldErrors.file = ["file: choose a CSV file"];
  const options = jsonField(form, "options", traceOptionsSchema, {});
  if (!options.ok) fieldErrors.options = options.errors;
  const settings = jsonField(form, "settings", traceSettingsSchema, {});
  if (!settings.ok) fieldErrors.settings = settings.errors;
  const revisionRaw = form.get("revisionId");
  const revisionId = typeof revisionRaw === "string" && revisionRaw !== "" ? revisionRaw : null;
  if (revisionId && !/^[0-9a-f-]{36}$/i.test(revisionId)) fieldErrors.revisionId = ["revisionId: not a revision id"];
  const labelRaw = form.get("label");
  const label = typeof labelRaw === "string" ? labelRaw.trim() : "";
  if (label.length > 200) fieldErrors.label = ["label: at most 200 characters"];
  if (hasControlCharacters(label)) fieldErrors.label = [controlCharacterMessage("label")];
  if (file && typeof file !== "string" && hasControlCharacters(file.name)) fieldErrors.file = [controlCharacterMessage("file name")];
  if (Object.keys(fieldErrors).length || !file || typeof file === "string" || !options.ok || !settings.ok) {
    const first = Object.values(fieldErrors)[0]?.[0] ?? "Invalid upload.";
    return { ok: false, status: 400, error: first, fieldErrors };
  }
  if (file.size > MAX_TRACE_BYTES) {
    return { ok: false, status: 413, error: `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is ${(MAX_TRACE_BYTES / 1048576).toFixed(1)} MB.` };
  }
  const text = await file.text();
  try {
    const parsed = parseTraceCsv(text, { timeUnit: options.value.timeUnit, channels: options.value.channels });
    // Column names from the file's header are stored with the trace: the same rule as typed text.
    if (parsed.channels.some((c) => hasControlCharacters(c.name))) {
      return { ok: false, status: 400, error: `${file.name}: ${controlCharacterMessage("column header")}`, fieldErrors: { file: [controlCharacterMessage("file: column header")] } };
    }
    return { ok: true, label: label || file.name, fileName: file.name, revisionId, options: options.value, settings: settings.value, parsed };
  } catch (e) {
    if (e instanceof TraceParseError) return { ok: false, status: 400, error: describeProblems(e.problems, file.name), problems: e.problems };
    throw e;
  }
}
