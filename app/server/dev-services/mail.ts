import { randomUUID } from "node:crypto";
import { mkdir, readdir, readFile, rename, writeFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

/** One captured message, as stored in `<dir>/<ISO time>-<id>.json`. */
export interface CapturedMail {
  id: string;
  /** ISO 8601 UTC time the capture received the message. */
  receivedAt: string;
  /** The From header as written (`Name <address>`), or the envelope sender when there is none. */
  from: string;
  /** Envelope recipients, lower-cased. */
  to: string[];
  /** The organisation the message is about (the application's X-Spanwright-Organisation header), if named. */
  organisationId: string | null;
  subject: string;
  /** Plain-text body ("" when the message has none). */
  text: string;
  /** HTML body, or null for a text-only message. */
  html: string | null;
}

export interface StartMailCaptureOptions {
  /** TCP port on 127.0.0.1. */
  port: number;
  /** Folder the messages are written to (created when missing). */
  dir: string;
}

export interface RunningMailCapture {
  port: number;
  stop(): Promise<void>;
}

const ID_PATTERN = /^[0-9a-f-]{36}$/;

function addressText(value: AddressObject | AddressObject[] | undefined): string | undefined {
  if (!value) return undefined;
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(", ") || undefined;
}

function headerText(value: unknown): string | null {
  return typeof value === "string" && value.trim() ? value.trim() : null;
}

function envelopeAddress(address: { address: string } | false): string {
  return address ? address.address : "";
}

/**
 * Starts an SMTP server on 127.0.0.1:`port` that delivers nothing: every message is parsed and
 * written as JSON into `dir` (to a temporary name, then renamed, so readers never see half a file)
 * before the server acknowledges it. No authentication is required and STARTTLS is not offered.
 */
export async function startMailCapture(opts: StartMailCaptureOptions): Promise<RunningMailCapture> {
  const dir = resolve(opts.dir);
  await mkdir(dir, { recursive: true });
  // Strictly increasing receive times keep "newest first" well defined for messages in the same millisecond.
  let lastReceived = 0;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    banner: "Spanwright mail capture (nothing is delivered)",
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          lastReceived = Math.max(Date.now(), lastReceived + 1);
          const receivedAt = new Date(lastReceived);
          const mail: CapturedMail = {
            id: randomUUID(),
            receivedAt: receivedAt.toISOString(),
            from: addressText(parsed.from) ?? envelopeAddress(session.envelope.mailFrom),
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            organisationId: headerText(parsed.headers.get("x-spanwright-organisation")),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
          };
          // Colons are not welcome in file names everywhere; the name still sorts by time.
          const name = `${mail.receivedAt.replace(/:/g, "-")}-${mail.id}.json`;
          const temporary = join(dir, `.${name}.tmp`);
          await writeFile(temporary, JSON.stringify(mail, null, 2));
          await rename(temporary, join(dir, name));
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolvePromise, reject) => {
    server.once("error", reject);
    server.listen(opts.port, "127.0.0.1", () => {
      server.off("error", reject);
      resolvePromise();
    });
  });
  // smtp-server reports client-side failures (dropped connections) as errors; they are not ours to crash on.
  server.on("error", () => undefined);
  const address = server.server.address();
  const port = typeof address === "object" && address ? address.port : opts.port;
  let stopping: Promise<void> | undefined;
  return {
    port,
    stop() {
      stopping ??= new Promise<void>((r) => server.close(() => r()));
      return stopping;
    },
  };
}

async function readMailFile(path: string): Promise<CapturedMail | undefined> {
  try {
    return JSON.parse(await readFile(path, "utf8")) as CapturedMail;
  } catch {
    return undefined;
  }
}

/**
 * Lists the messages captured in `dir`, newest first. `to` keeps only those addressed to that
 * recipient (compared case-insensitively). A missing folder means no mail yet. Messages captured
 * before the organisation was recorded read as naming none.
 */
export async function listCapturedMail(dir: string, opts: { to?: string } = {}): Promise<CapturedMail[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw error;
  }
  const files = names.filter((n) => n.endsWith(".json") && !n.startsWith("."));
  const mails = (await Promise.all(files.map((n) => readMailFile(join(dir, n))))).filter((m): m is CapturedMail => m !== undefined).map((m) => ({ ...m, organisationId: m.organisationId ?? null }));
  const to = opts.to?.trim().toLowerCase();
  return mails
    .filter((m) => !to || m.to.includes(to))
    .sort((a, b) => (a.receivedAt === b.receivedAt ? 0 : a.receivedAt < b.receivedAt ? 1 : -1));
}

/** Reads one captured message by id, or undefined when there is none with that id. */
export async function readCapturedMail(dir: string, id: string): Promise<CapturedMail | undefined> {
  if (!ID_PATTERN.test(id)) return undefined;
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return undefined;
  }
  const name = names.find((n) => n.endsWith(`-${id}.json`) && !n.startsWith("."));
  return name ? readMailFile(join(dir, name)) : undefined;
}
