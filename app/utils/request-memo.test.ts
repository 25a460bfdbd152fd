import { AsyncResource } from "node:async_hooks";
import type { AddressInfo } from "node:net";
import { describe, expect, it } from "vitest";
import { createApp } from "~/server/http";
import { memoised, withRequestMemo } from "./request-memo.server";

describe("the per-request memo", () => {
  it("runs a read once per key inside one scope, and again in the next scope", async () => {
    let loads = 0;
    const read = () => memoised("k", async () => ++loads);
    await withRequestMemo(async () => {
      expect(await Promise.all([read(), read(), read()])).toEqual([1, 1, 1]);
    });
    await withRequestMemo(async () => expect(await read()).toBe(2));
  });

  it("keeps keys apart and memoises nothing outside a scope", async () => {
    let loads = 0;
    await withRequestMemo(async () => {
      await memoised("a", async () => ++loads);
      await memoised("b", async () => ++loads);
    });
    await memoised("a", async () => ++loads);
    await memoised("a", async () => ++loads);
    expect(loads).toBe(4);
  });

  it("does not keep a failed read, so a retry in the same request reads again", async () => {
    let loads = 0;
    await withRequestMemo(async () => {
      await expect(memoised("k", async () => Promise.reject(new Error(`outage ${++loads}`)))).rejects.toThrow("outage 1");
      expect(await memoised("k", async () => ++loads)).toBe(2);
    });
  });

  it("ends with its request: work left running in the request's context reads afresh", async () => {
    let loads = 0;
    let end!: () => void;
    let later!: () => Promise<number>;
    await withRequestMemo(
      async () => {
        await memoised("k", async () => ++loads);
        // A timer or a client started inside the request keeps its async context after the answer.
        later = AsyncResource.bind(() => memoised("k", async () => ++loads));
      },
      (e) => (end = e),
    );
    expect(await later()).toBe(1);
    end();
    expect(await later()).toBe(2);
    expect(await later()).toBe(3);
  });

  it("is opened by the web server for reading requests only, so an action never sees a read made before its write", async () => {
    let loads = 0;
    const app = createApp({ origin: "http://127.0.0.1", dev: false }, (a) =>
      a.all("/probe", async (_req, res) => {
        const before = loads;
        await memoised("probe", async () => ++loads);
        await memoised("probe", async () => ++loads);
        res.json({ reads: loads - before });
      }),
    );
    const server = app.listen(0, "127.0.0.1");
    await new Promise((r) => server.once("listening", r));
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    try {
      expect(await (await fetch(`${base}/probe`)).json()).toEqual({ reads: 1 });
      expect(await (await fetch(`${base}/probe`, { method: "POST" })).json()).toEqual({ reads: 2 });
    } finally {
      server.close();
    }
  });
});
