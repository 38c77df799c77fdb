import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { env } from "../utils/env.server";

export type ReceivedMail = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
};

/** The outbox page exists only where the local SMTP fake runs (development and tests). */
export function outboxAvailable(): boolean {
  const e = env();
  return e.THERMOTALLY_ENV !== "production" && Boolean(e.MAILBOX_DIR);
}

/** Messages the local SMTP fake received, newest first. */
export async function listReceivedMail(limit = 100): Promise<ReceivedMail[]> {
  const dir = env().MAILBOX_DIR;
  if (!dir) return [];
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  names.sort().reverse();
  const messages = await Promise.all(
    names.slice(0, limit).map(async (name) => {
      const m = JSON.parse(await readFile(path.join(dir, name), "utf8"));
      return {
        id: String(m.id ?? name),
        receivedAt: String(m.receivedAt ?? ""),
        from: String(m.from ?? ""),
        to: Array.isArray(m.to) ? m.to.map(String) : [String(m.to ?? "")],
        subject: String(m.subject ?? ""),
        text: String(m.text ?? ""),
      };
    }),
  );
  return messages;
}
