import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { NextRequest } from "next/server";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import manifest from "@/app/manifest";
import { proxy } from "@/proxy";

// What a browser needs to offer "Install" (W3C Web App Manifest; Chromium's installability
// check, from memory: a name, a start URL, display standalone, a 192 px and a 512 px icon).
describe("the installed web app", () => {
  const m = manifest();

  it("opens on the bench board in its own window", () => {
    expect(m.start_url).toBe("/board");
    expect(m.display).toBe("standalone");
    expect(m.name).toBeTruthy();
    expect(m.short_name!.length).toBeLessThanOrEqual(12);
  });

  it("has our own icons in public/, each the size it claims", async () => {
    const pngs = (m.icons ?? []).filter((i) => i.type === "image/png");
    expect(pngs.map((i) => i.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    expect(pngs.some((i) => i.purpose === "maskable")).toBe(true);
    for (const icon of m.icons ?? []) {
      const file = path.join(process.cwd(), "public", icon.src);
      expect(existsSync(file), icon.src).toBe(true);
      if (icon.type !== "image/png") continue;
      const meta = await sharp(readFileSync(file)).metadata();
      expect(`${meta.width}x${meta.height}`, icon.src).toBe(icon.sizes);
    }
  });

  it("is served without a session: the browser fetches the manifest and icons without cookies", async () => {
    for (const p of ["/manifest.webmanifest", "/icons/icon-192.png"]) {
      const res = await proxy(new NextRequest(`http://localhost:3000${p}`));
      expect(res.headers.get("location"), p).toBeNull();
    }
    // A page still sends an anonymous visitor to sign in.
    const page = await proxy(new NextRequest("http://localhost:3000/board"));
    expect(page.headers.get("location")).toContain("/sign-in");
  });
});
