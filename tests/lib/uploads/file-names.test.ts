import path from "node:path";
import { describe, expect, it } from "vitest";
import {
  contentDisposition,
  downloadName,
  newStoredName,
  sanitiseDisplayName,
  STORED_NAME,
} from "@/lib/uploads/file-names";
import { storedFilePath } from "@/lib/uploads/storage";

describe("sanitiseDisplayName", () => {
  it("keeps only the last part of a path, whichever separator it uses", () => {
    expect(sanitiseDisplayName("../../etc/passwd.jpg", "jpg")).toBe("passwd.jpg");
    expect(sanitiseDisplayName("C:\\Users\\bench\\rods.png", "png")).toBe("rods.png");
  });

  it("drops NUL and other control characters, and right-to-left overrides", () => {
    expect(sanitiseDisplayName("crank\u0000.jpg\u0000.exe", "jpg")).toBe("crank.jpg.exe");
    expect(sanitiseDisplayName("line\r\nbreak.pdf", "pdf")).toBe("linebreak.pdf");
    expect(sanitiseDisplayName("photo\u202egnp.exe", "png")).toBe("photognp.exe");
  });

  it("drops leading dots so nothing looks hidden, and falls back to a plain name", () => {
    expect(sanitiseDisplayName(".htaccess", "png")).toBe("htaccess");
    expect(sanitiseDisplayName("..", "jpg")).toBe("upload.jpg");
    expect(sanitiseDisplayName("   ", "pdf")).toBe("upload.pdf");
  });

  it("shortens a long name to 120 characters, keeping its extension", () => {
    const name = sanitiseDisplayName(`${"a".repeat(300)}.jpeg`, "jpg");
    expect(name).toHaveLength(120);
    expect(name.endsWith(".jpeg")).toBe(true);
  });
});

describe("download names and headers", () => {
  it("offers the file under the extension of what it really is", () => {
    expect(downloadName("photo.exe", "png")).toBe("photo.png");
    expect(downloadName("printout", "pdf")).toBe("printout.pdf");
  });

  it("writes an ASCII fallback and the UTF-8 name without quotes that could break the header", () => {
    expect(contentDisposition("inline", 'Kurbelwelle "vorher" ü.jpg')).toBe(
      `inline; filename="Kurbelwelle _vorher_ _.jpg"; filename*=UTF-8''Kurbelwelle%20%22vorher%22%20%C3%BC.jpg`,
    );
  });
});

describe("stored names", () => {
  it("are random hex with the detected extension, and a matching thumbnail name", () => {
    const a = newStoredName("png");
    const b = newStoredName("png");
    expect(a.stored).toMatch(STORED_NAME);
    expect(a.thumbnail).toMatch(STORED_NAME);
    expect(a.thumbnail.slice(0, 32)).toBe(a.stored.slice(0, 32));
    expect(a.stored).not.toBe(b.stored);
  });

  it("are the only names that can be opened under the uploads folder", () => {
    const dir = path.resolve("/srv/uploads");
    const ok = newStoredName("pdf").stored;
    expect(storedFilePath(ok, dir)).toBe(path.join(dir, ok));
    for (const bad of [
      "../x.png",
      "a/b.png",
      `${"0".repeat(32)}.svg`,
      `${"0".repeat(32)}.png\u0000`,
    ]) {
      expect(() => storedFilePath(bad, dir)).toThrow(/not a stored file name/);
    }
  });
});
