import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as acceptInvite } from "@/app/api/invites/accept/route";
import { GET as listUsersRoute, POST as postUser } from "@/app/api/users/route";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { nestsDeeperThan } from "@/lib/http/body";
import { json, parseJson, route } from "@/lib/http/route";
import { resetEnvCache } from "@/lib/env";
import { z } from "zod";
import { addOneOfEachRole, countRows, freshDb } from "../helpers/db";
import { noParams } from "../helpers/http";
import { signInAs } from "../helpers/session";

// The request guard at the API edge (lib/http/route.ts), called the way Next calls a handler.
// Each case is one a browser or a script can send; the comments say what a real request carries.

const APP = "http://localhost:3000"; // NEXTAUTH_URL's default in lib/env.ts
const NEW_OWNER = JSON.stringify({
  email: "intruder@elsewhere.test",
  name: "Not Ours",
  password: "long enough password",
  role: "owner",
});

function request(
  method: string,
  path: string,
  init: { body?: BodyInit; headers?: Record<string, string> } = {},
): Request {
  return new Request(new URL(path, APP), {
    method,
    headers: { host: "localhost:3000", ...init.headers },
    body: init.body,
    ...(init.body instanceof ReadableStream ? { duplex: "half" } : {}),
  } as RequestInit);
}

/** POST /api/users (NEW_OWNER unless another body is given), as Next calls the handler. */
function postToUsers(headers: Record<string, string>, body: BodyInit = NEW_OWNER) {
  return postUser(request("POST", "/api/users", { body, headers }), noParams);
}

/** POST /api/invites/accept with a body said to be JSON (and any more headers). */
function postToInviteAccept(body: BodyInit, headers: Record<string, string> = {}) {
  return acceptInvite(
    request("POST", "/api/invites/accept", {
      body,
      headers: { "content-type": "application/json", ...headers },
    }),
    noParams,
  );
}

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  signInAs(users.owner);
});

afterEach(() => {
  vi.unstubAllEnvs();
  resetEnvCache();
});

describe("a state-changing request from another site (cross-site request forgery)", () => {
  it("refuses the owner's browser posting a text/plain form from another port of the same host", async () => {
    // What a page on http://localhost:4000 sends by auto-submitting <form enctype="text/plain">
    // to /api/users: the owner's cookie (same site), its own Origin, and a body that reads as JSON.
    const before = await countRows(db, "users");
    const res = await postToUsers({
      "content-type": "text/plain",
      "content-length": String(NEW_OWNER.length),
      origin: "http://localhost:4000",
      "sec-fetch-site": "same-site",
    });
    expect(res.status).toBe(403);
    expect((await res.json()).error.code).toBe("cross_site");
    expect(await countRows(db, "users")).toBe(before);
  });

  it("refuses a foreign Origin even when the browser sends no Sec-Fetch-Site", async () => {
    const res = await postToUsers({
      "content-type": "application/json",
      origin: "http://localhost:4000",
    });
    expect(res.status).toBe(403);
  });

  it.each([["null"], ["http://localhost:3000.evil.test"], ["not a url"]])(
    "refuses Origin %j",
    async (origin) => {
      const res = await postToUsers({ "content-type": "application/json", origin });
      expect(res.status).toBe(403);
    },
  );

  it("accepts the app's own pages: its origin, the host asked for, or the browser's same-origin", async () => {
    const own: Record<string, string>[] = [
      { origin: APP },
      // The demo serves on 127.0.0.1 while NEXTAUTH_URL names localhost.
      { origin: "http://127.0.0.1:3000", host: "127.0.0.1:3000" },
      { "sec-fetch-site": "same-origin", origin: "http://127.0.0.1:3000" },
    ];
    for (const [i, headers] of own.entries()) {
      const body = NEW_OWNER.replace("intruder@", `colleague-${i}@`);
      const res = await postToUsers({ "content-type": "application/json", ...headers }, body);
      expect(res.status, JSON.stringify(headers)).toBe(201);
    }
  });

  it("accepts the origin named by APP_URL", async () => {
    vi.stubEnv("APP_URL", "https://bench.example.test");
    resetEnvCache();
    const res = await postToUsers({
      "content-type": "application/json",
      origin: "https://bench.example.test",
    });
    expect(res.status).toBe(201);
  });

  it("lets a script without Origin through to the session check, and reads stay open to links", async () => {
    const res = await postToUsers({ "content-type": "application/json" });
    expect(res.status).toBe(201);
    const read = await listUsersRoute(
      request("GET", "/api/users", { headers: { "sec-fetch-site": "cross-site" } }),
      noParams,
    );
    expect(read.status).toBe(200);
  });
});

describe("the body's media type", () => {
  it("answers 415 to JSON sent as text/plain, and writes nothing", async () => {
    const before = await countRows(db, "users");
    const res = await postToUsers({ "content-type": "text/plain" });
    expect(res.status).toBe(415);
    expect(await res.json()).toEqual({
      error: {
        code: "unsupported_media_type",
        message: "Send the request body as JSON with Content-Type: application/json.",
      },
    });
    expect(await countRows(db, "users")).toBe(before);
  });

  it.each([["application/x-www-form-urlencoded"], ["multipart/form-data; boundary=x"], [""]])(
    "answers 415 to a declared body of type %j",
    async (type) => {
      const res = await postToUsers({
        "content-type": type,
        "content-length": String(NEW_OWNER.length),
      });
      expect(res.status).toBe(415);
    },
  );

  it("accepts application/json with a charset", async () => {
    const res = await postToUsers({ "content-type": "Application/JSON; charset=utf-8" });
    expect(res.status).toBe(201);
  });
});

/** A body that fails the test if anything reads it. */
function unreadableBody(): ReadableStream<Uint8Array> {
  return new ReadableStream({
    pull() {
      throw new Error("the body was read");
    },
  });
}

describe("the body's size and depth", () => {
  it("refuses a declared 9.9 MB body with 413 before reading a byte", async () => {
    signInAs(null);
    const started = performance.now();
    const res = await postToInviteAccept(unreadableBody(), { "content-length": "9900000" });
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe("too_large");
    expect(performance.now() - started).toBeLessThan(200);
  });

  it("stops reading a body that does not say its length once it passes 1 MiB", async () => {
    signInAs(null);
    let sent = 0;
    const chunk = new TextEncoder().encode("[".repeat(64 * 1024));
    const endless = new ReadableStream<Uint8Array>({
      pull(controller) {
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const res = await postToInviteAccept(endless);
    expect(res.status).toBe(413);
    // 1 MiB = 16 chunks of 64 KiB; the 17th passes it. A few more may be queued ahead.
    expect(sent).toBeLessThan(24 * 64 * 1024);
  });

  it("refuses nesting deeper than 16 with 400 before parsing, and parses 16", async () => {
    signInAs(null);
    const deep = `${"[".repeat(17)}${"]".repeat(17)}`;
    const res = await postToInviteAccept(deep);
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe("too_deep");

    const echo = route(async (req) => json({ got: await parseJson(req, z.unknown()) }));
    const ok = await echo(
      request("POST", "/x", {
        body: `${"[".repeat(16)}${"]".repeat(16)}`,
        headers: { "content-type": "application/json" },
      }),
      noParams,
    );
    expect(ok.status).toBe(200);
  });

  it("finds the depth of a megabyte of brackets in milliseconds, and skips brackets in strings", () => {
    const megabyte = "[".repeat(1024 * 1024);
    const started = performance.now();
    expect(nestsDeeperThan(megabyte, 16)).toBe(true);
    expect(nestsDeeperThan(`${megabyte.slice(0, 5)}1${"]".repeat(5)}`, 16)).toBe(false);
    expect(performance.now() - started).toBeLessThan(100);
    expect(nestsDeeperThan(`{"a":"${"[".repeat(40)}\\"${"{".repeat(40)}"}`, 16)).toBe(false);
    expect(nestsDeeperThan(`[${'"\\\\"'}${",[".repeat(20)}`, 16)).toBe(true);
  });

  it("takes a larger body where the route says so", async () => {
    const big = route({ maxBytes: 4 * 1024 * 1024 }, async (req) =>
      json({ length: String((await parseJson(req, z.string())).length) }),
    );
    const text = JSON.stringify("x".repeat(2 * 1024 * 1024));
    const res = await big(
      request("POST", "/x", {
        body: text,
        headers: { "content-type": "application/json", "content-length": String(text.length) },
      }),
      noParams,
    );
    expect(res.status).toBe(200);
  });
});

describe("caching of API answers", () => {
  it("marks every answer private and not to be stored, keyed on the cookie", async () => {
    const res = await listUsersRoute(request("GET", "/api/users"), noParams);
    expect(res.headers.get("cache-control")).toBe("private, no-store");
    expect(res.headers.get("vary")).toBe("Cookie");
    signInAs(null);
    const refused = await listUsersRoute(request("GET", "/api/users"), noParams);
    expect(refused.status).toBe(401);
    expect(refused.headers.get("cache-control")).toBe("private, no-store");
  });

  it("keeps a route's own private caching and adds Cookie to its Vary", async () => {
    const file = route(
      async () =>
        new Response("x", { headers: { "cache-control": "private, no-cache", vary: "Accept" } }),
    );
    const res = await file(request("GET", "/x"), noParams);
    expect(res.headers.get("cache-control")).toBe("private, no-cache");
    expect(res.headers.get("vary")).toBe("Accept, Cookie");
  });

  it("sends Strict-Transport-Security only when HSTS=on", async () => {
    expect(
      (await listUsersRoute(request("GET", "/api/users"), noParams)).headers.has(
        "strict-transport-security",
      ),
    ).toBe(false);
    vi.stubEnv("HSTS", "on");
    resetEnvCache();
    const res = await listUsersRoute(request("GET", "/api/users"), noParams);
    expect(res.headers.get("strict-transport-security")).toBe("max-age=31536000");
  });
});
