import { describe, expect, it } from "vitest";
import { DEFAULT_AFTER_SIGN_IN, safeNextPath } from "@/lib/auth/safe-next";
import { clientAddress } from "@/lib/auth/throttle";

// Where the browser goes after signing in. The cases that must fall back are read the way the
// WHATWG URL Standard says a browser reads them: in http(s) URLs "\" is a path separator like
// "/", and tab, CR and LF are removed before parsing, so "/\host" and "/<tab>/host" are "//host",
// a URL on another host. The page receives `next` already percent-decoded ("%5C" → "\").
describe("the page to open after signing in", () => {
  it.each([
    ["/customers", "/customers"],
    ["/jobs/12?tab=scale", "/jobs/12?tab=scale"],
    ["/jobs/12#bobweights", "/jobs/12#bobweights"],
    ["/jobs/../users", "/users"],
  ])("keeps a path on this app: %s", (next, expected) => {
    expect(safeNextPath(next)).toBe(expected);
  });

  it.each([
    ["//evil.test/phish", "protocol-relative URL"],
    ["/\\evil.test/phish", "backslash read as a slash (sent as /%5C…)"],
    ["/\\/evil.test/phish", "backslash then slash"],
    ["/\t/evil.test/phish", "tab removed by the parser (sent as /%09/…)"],
    ["/\n/evil.test", "newline removed by the parser"],
    ["https://evil.test/", "absolute URL"],
    ["javascript:alert(1)", "script URL"],
    ["evil.test", "no leading slash"],
    ["", "empty"],
    ["/sign-in?next=/jobs", "the sign-in page itself"],
    ["/api/users", "an API answer rather than a page"],
  ])("falls back to the default page for %j (%s)", (next) => {
    expect(safeNextPath(next)).toBe(DEFAULT_AFTER_SIGN_IN);
  });

  it("falls back when next is missing or repeated", () => {
    expect(safeNextPath(undefined)).toBe(DEFAULT_AFTER_SIGN_IN);
    expect(safeNextPath(["/jobs", "//evil.test"])).toBe(DEFAULT_AFTER_SIGN_IN);
  });
});

describe("the client address a sign-in is counted against", () => {
  it("is the last X-Forwarded-For entry: the one the nearest proxy (or Next.js) added", () => {
    const headers = new Headers({ "x-forwarded-for": "198.51.100.1, 203.0.113.7" });
    expect(clientAddress(headers)).toBe("203.0.113.7");
    expect(clientAddress({ "x-forwarded-for": "192.0.2.10" })).toBe("192.0.2.10");
  });

  it("reads an IPv4 address seen through an IPv6 socket as itself, and keeps IPv6", () => {
    expect(clientAddress({ "x-forwarded-for": "::ffff:127.0.0.1" })).toBe("127.0.0.1");
    expect(clientAddress({ "x-forwarded-for": "2001:db8::1" })).toBe("2001:db8::1");
  });

  it("is unknown when the header is missing or is not an address", () => {
    expect(clientAddress(undefined)).toBeNull();
    expect(clientAddress(new Headers())).toBeNull();
    expect(clientAddress({ "x-forwarded-for": "<script>" })).toBeNull();
  });
});
