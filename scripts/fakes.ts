/**
 * Local stand-ins for the outside services, on 127.0.0.1 only:
 *
 *  - an SMTP server (smtp-server) that accepts any sender, recipient and AUTH, and stores every
 *    message as $MAILBOX_DIR/<timestamp>-<id>.json: {id, receivedAt, from, to, subject, text, html, raw}
 *  - an S3 server (s3rver) keeping its objects under $S3_DIR, with bucket $S3_BUCKET created
 *
 * Run: node --import tsx scripts/fakes.ts [--smtp|--no-smtp] [--s3|--no-s3]   (both by default)
 * Env: SMTP_FAKE_PORT (2525), S3_FAKE_PORT (4569), MAILBOX_DIR (.data/mailbox), S3_DIR (.data/s3),
 *      S3_BUCKET (thermotally), FAKES_PID_FILE (written once everything listens, removed on exit),
 *      FAKES_PARENT_PID (exit when that process is gone).
 * Exits cleanly on SIGTERM / SIGINT. Normally started by scripts/lib.sh (start_fakes).
 */
import { createRequire } from "node:module";
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type { Server } from "node:http";
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";

const require = createRequire(import.meta.url);

const argv = process.argv.slice(2);
function flag(name: string, fallback: boolean): boolean {
  if (argv.includes(`--${name}`)) return true;
  if (argv.includes(`--no-${name}`)) return false;
  return fallback;
}

const HOST = "127.0.0.1";
const wantSmtp = flag("smtp", true);
const wantS3 = flag("s3", true);
const smtpPort = Number(process.env.SMTP_FAKE_PORT ?? 2525);
const s3Port = Number(process.env.S3_FAKE_PORT ?? 4569);
const mailboxDir = path.resolve(process.env.MAILBOX_DIR ?? ".data/mailbox");
const s3Dir = path.resolve(process.env.S3_DIR ?? ".data/s3");
const bucket = process.env.S3_BUCKET ?? "thermotally";
const pidFile = process.env.FAKES_PID_FILE;
const parentPid = Number(process.env.FAKES_PARENT_PID ?? 0);

function log(message: string): void {
  console.log(`${new Date().toISOString()} [fakes] ${message}`);
}

function addressList(value: AddressObject | AddressObject[] | undefined): string[] {
  const objects = value === undefined ? [] : Array.isArray(value) ? value : [value];
  return objects.flatMap((o) => o.value.map((a) => a.address ?? "").filter((a) => a !== ""));
}

async function storeMessage(raw: Buffer, envelopeFrom: string, envelopeTo: string[]): Promise<string> {
  const parsed = await simpleParser(raw);
  const id = randomUUID();
  const receivedAt = new Date();
  const headerTo = [...addressList(parsed.to), ...addressList(parsed.cc)];
  const message = {
    id,
    receivedAt: receivedAt.toISOString(),
    from: parsed.from?.text ?? envelopeFrom,
    to: envelopeTo.length > 0 ? envelopeTo : headerTo,
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : null,
    raw: raw.toString("utf8"),
  };
  fs.mkdirSync(mailboxDir, { recursive: true });
  const name = `${receivedAt.getTime()}-${id}.json`;
  // Write then rename, so a reader never sees half a message (the temp name does not end in .json).
  const tmp = path.join(mailboxDir, `.${name}.tmp`);
  await fs.promises.writeFile(tmp, JSON.stringify(message, null, 2));
  await fs.promises.rename(tmp, path.join(mailboxDir, name));
  return name;
}

function startSmtp(): Promise<SMTPServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    allowInsecureAuth: true,
    logger: false,
    size: 25 * 1024 * 1024,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? "any" });
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", (err) => callback(err));
      stream.on("end", () => {
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
        const to = session.envelope.rcptTo.map((r) => r.address);
        storeMessage(Buffer.concat(chunks), from, to).then(
          (name) => {
            log(`smtp: stored ${name} (to ${to.join(", ")})`);
            callback();
          },
          (err: unknown) => {
            log(`smtp: could not store a message: ${String(err)}`);
            callback(err instanceof Error ? err : new Error(String(err)));
          },
        );
      });
    },
  });
  server.on("error", (err) => log(`smtp: ${err.message}`));
  return new Promise((resolve, reject) => {
    const onError = (err: Error) => reject(err);
    server.server.once("error", onError);
    server.listen(smtpPort, HOST, () => {
      server.server.off("error", onError);
      fs.mkdirSync(mailboxDir, { recursive: true });
      log(`smtp listening on ${HOST}:${smtpPort}, mailbox ${mailboxDir}`);
      resolve(server);
    });
  });
}

interface S3rverInstance {
  run(): Promise<{ address: string; port: number }>;
  close(): Promise<void>;
  httpServer?: Server;
}
type S3rverConstructor = new (options: Record<string, unknown>) => S3rverInstance;

async function startS3(): Promise<S3rverInstance> {
  // s3rver ships no type declarations: load it through require with a small local interface.
  const S3rver = require("s3rver") as S3rverConstructor;
  fs.mkdirSync(s3Dir, { recursive: true });
  const server = new S3rver({
    address: HOST,
    port: s3Port,
    silent: true,
    directory: s3Dir,
    configureBuckets: [{ name: bucket }],
  });
  await server.run();
  log(`s3 listening on http://${HOST}:${s3Port}, bucket ${bucket}, data ${s3Dir}`);
  return server;
}

let smtp: SMTPServer | undefined;
let s3: S3rverInstance | undefined;
let stopping = false;

async function shutdown(reason: string, code = 0): Promise<void> {
  if (stopping) return;
  stopping = true;
  log(`stopping (${reason})`);
  const force = setTimeout(() => process.exit(code), 5000);
  force.unref();
  await Promise.allSettled([
    smtp ? new Promise<void>((resolve) => smtp!.close(() => resolve())) : Promise.resolve(),
    s3 ? s3.close() : Promise.resolve(),
  ]);
  if (pidFile) {
    try {
      if (fs.readFileSync(pidFile, "utf8").trim() === String(process.pid)) fs.unlinkSync(pidFile);
    } catch {
      // already gone
    }
  }
  process.exit(code);
}

process.on("SIGTERM", () => void shutdown("SIGTERM"));
process.on("SIGINT", () => void shutdown("SIGINT"));
process.on("SIGHUP", () => void shutdown("SIGHUP"));

try {
  if (wantSmtp) smtp = await startSmtp();
  if (wantS3) s3 = await startS3();
} catch (err) {
  log(`could not start: ${err instanceof Error ? err.message : String(err)}`);
  await shutdown("start-up failure", 1);
}

if (pidFile) {
  fs.mkdirSync(path.dirname(path.resolve(pidFile)), { recursive: true });
  fs.writeFileSync(pidFile, `${process.pid}\n`);
}
log(`ready (pid ${process.pid})`);

if (parentPid > 0) {
  setInterval(() => {
    try {
      process.kill(parentPid, 0);
    } catch {
      void shutdown(`parent ${parentPid} is gone`);
    }
  }, 1000).unref();
  // keep the process alive even if no server holds the event loop
  setInterval(() => {}, 1 << 30);
}
