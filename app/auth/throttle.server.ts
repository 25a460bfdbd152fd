import { encodeBase32LowerCaseNoPadding } from "@oslojs/encoding";
import { and, count, eq, gt, max } from "drizzle-orm";
import { createCookie } from "react-router";
import { sha256Hex } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { knownDevices, signInAttempts } from "~/db/schema";
import type { CredentialPurpose } from "~/domain/vocabulary";
import { cookiesSecure } from "~/utils/env.server";

/**
 * Throttling of password attempts without a lock-out anyone else can cause. Failures are counted
 * per account and per client address over THROTTLE_WINDOW_MS; after a few free ones, each further
 * attempt must wait a delay that doubles with every failure (never a hard block, never longer than
 * MAX_DELAY_MS). A browser that has signed in to the account with its password before carries a
 * device cookie and is not held back by the strangers' failures: it has an allowance of its own.
 */

/** Failures are counted over this long; older ones are forgotten. */
export const THROTTLE_WINDOW_MS = 60 * 60 * 1000;
/** The first delay once the free failures are used; it doubles with each further failure. */
export const BASE_DELAY_MS = 2_000;
/** No delay is longer than this. */
export const MAX_DELAY_MS = 15 * 60 * 1000;
/** Failures allowed without a delay: per account from unknown browsers, per address, per known device. */
export const FREE_FAILURES = { account: 3, address: 10, device: 10 } as const;

/** The delay before the next attempt after `failures` failures of which `free` cost nothing. */
export function delayAfter(failures: number, free: number): number {
  if (failures <= free) return 0;
  return Math.min(MAX_DELAY_MS, BASE_DELAY_MS * 2 ** (failures - free - 1));
}

export type Throttle = { ok: true } | { ok: false; retryAfterSeconds: number; message: string };

async function failuresOf(purpose: CredentialPurpose, by: { email: string } | { address: string }, device: boolean) {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MS);
  const who = "email" in by ? eq(signInAttempts.email, by.email) : eq(signInAttempts.address, by.address);
  const [row] = await db
    .select({ n: count(), last: max(signInAttempts.at) })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.purpose, purpose), who, eq(signInAttempts.device, device), eq(signInAttempts.succeeded, false), gt(signInAttempts.at, since)));
  return { n: row?.n ?? 0, last: row?.last ?? null };
}

function wait(failures: { n: number; last: Date | null }, free: number): number {
  const delay = delayAfter(failures.n, free);
  if (!delay || !failures.last) return 0;
  return Math.max(0, failures.last.getTime() + delay - Date.now());
}

function inWords(ms: number): string {
  const s = Math.ceil(ms / 1000);
  return s < 90 ? `${s} second${s === 1 ? "" : "s"}` : `${Math.ceil(s / 60)} minutes`;
}

/**
 * Whether an attempt may be made now. `email` is the account asked for (known or not: an unknown
 * address is throttled alike, so the answer tells nothing); `address` is counted only for sign-in,
 * where a stranger can try many accounts; `device` says the browser is known to that account.
 */
export async function checkThrottle(input: { purpose: CredentialPurpose; email: string; address?: string; device: boolean }): Promise<Throttle> {
  const waits = input.device
    ? [wait(await failuresOf(input.purpose, { email: input.email }, true), FREE_FAILURES.device)]
    : [
        wait(await failuresOf(input.purpose, { email: input.email }, false), FREE_FAILURES.account),
        input.address ? wait(await failuresOf(input.purpose, { address: input.address }, false), FREE_FAILURES.address) : 0,
      ];
  const ms = Math.max(...waits);
  if (ms <= 0) return { ok: true };
  return { ok: false, retryAfterSeconds: Math.ceil(ms / 1000), message: `Too many wrong passwords. Wait ${inWords(ms)}, then try again.` };
}

/** Records one attempt; only failures count against later ones. */
export async function recordAttempt(input: { purpose: CredentialPurpose; email: string; address: string; device: boolean; succeeded: boolean }): Promise<void> {
  await db.insert(signInAttempts).values(input);
}

// ---------------------------------------------------------------- known devices

const DEVICE_MAX_AGE_S = 365 * 24 * 60 * 60;
let deviceCookieStore: ReturnType<typeof createCookie> | undefined;
function deviceCookie() {
  deviceCookieStore ??= createCookie("sw_device", { httpOnly: true, sameSite: "lax", secure: cookiesSecure(), path: "/", maxAge: DEVICE_MAX_AGE_S });
  return deviceCookieStore;
}

/** The device token of the request's cookie, if it carries a well-formed one. */
export async function deviceTokenOf(cookieHeader: string | null): Promise<string | null> {
  if (!cookieHeader || !/(?:^|;\s*)sw_device=/.test(cookieHeader)) return null;
  const token = (await deviceCookie().parse(cookieHeader).catch(() => null)) as unknown;
  return typeof token === "string" && /^[a-z2-7]{32}$/.test(token) ? token : null;
}

/** Whether this browser has signed in to this account with its password before. */
export async function isKnownDevice(token: string | null, userId: string): Promise<boolean> {
  if (!token) return false;
  const [row] = await db.select({ userId: knownDevices.userId }).from(knownDevices).where(and(eq(knownDevices.tokenHash, sha256Hex(token)), eq(knownDevices.userId, userId)));
  return Boolean(row);
}

/**
 * After a successful password sign-in: the browser becomes known to the account. Keeps the token it
 * has (one token serves every account signed in from that browser) or gives it one; returns the
 * Set-Cookie header that (re)sets it.
 */
export async function rememberDevice(token: string | null, userId: string): Promise<string> {
  let value = token;
  if (!value) {
    const bytes = new Uint8Array(20);
    crypto.getRandomValues(bytes);
    value = encodeBase32LowerCaseNoPadding(bytes);
  }
  await db
    .insert(knownDevices)
    .values({ tokenHash: sha256Hex(value), userId })
    .onConflictDoUpdate({ target: [knownDevices.tokenHash, knownDevices.userId], set: { lastUsedAt: new Date() } });
  return deviceCookie().serialize(value);
}
