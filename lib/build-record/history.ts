import type { JobChange } from "@/db/audit";
import type { BuildSection } from "./schemas";

// The build record's entries in the job's change list, as sentences in the trade's words: a
// section saved (what changed in it, figures as typed, with the unit in force when it was saved),
// a customer's request written down, ticked or explained, a revision of the PDF issued or
// e-mailed. Entries that changed nothing say nothing.

/** The audited units of a section save: a section's own snapshot carries none, specs do. */
export interface RecordedUnits {
  lengthUnit?: "in" | "mm";
  loadUnit?: "lb" | "N";
}

const SECTION_TITLES: Record<BuildSection, string> = {
  specs: "Engine figures",
  rings: "Ring gaps",
  tdc: "True TDC",
  cam: "Cam checks",
  springs: "Valve springs",
  clearances: "Bearing clearances",
  deck: "Deck clearance",
};

/** How many changes one sentence names before "and N more". */
const MOST_NAMED = 6;

type Flat = Map<string, string>;
type Obj = Record<string, unknown>;

const text = (v: unknown): string | null =>
  typeof v === "string" && v !== "" ? v : typeof v === "number" ? String(v) : null;
const asObj = (v: unknown): Obj => (v && typeof v === "object" ? (v as Obj) : {});
const rowsOf = (v: unknown): Obj[] => {
  const rows = asObj(v).rows;
  return Array.isArray(rows) ? (rows as Obj[]) : [];
};
/** A figure as typed, with its unit when there is one ("0.50 mm", "-18°", "64.0 cc"). */
const withUnit = (v: unknown, unit: string | undefined): string | null => {
  const t = text(v);
  if (t === null) return null;
  if (!unit) return t;
  return unit === "°" ? `${t}°` : `${t} ${unit}`;
};
const put = (flat: Flat, key: string, value: string | null) => {
  if (value !== null) flat.set(key, value);
};

const RINGS = { top: "top ring", second: "second ring", oil: "oil rails" } as Record<
  string,
  string
>;
const SIDES = ["front", "rear"];
const DIRECTIONS = ["vertical", "horizontal"];

/** Every figure of a section as "where" → "what it reads", for comparing two saves. */
function flatten(section: BuildSection, data: unknown, units: RecordedUnits): Flat {
  const flat: Flat = new Map();
  const len = units.lengthUnit;
  const load = units.loadUnit;
  if (section === "specs") {
    const s = asObj(data);
    const l = text(s.lengthUnit) ?? len;
    put(flat, "lengths in", text(s.lengthUnit));
    put(flat, "spring loads in", text(s.loadUnit));
    put(flat, "finished bore", withUnit(s.bore, l));
    put(flat, "stroke", withUnit(s.stroke, l));
    put(flat, "ring maker", text(s.ringMaker));
    put(flat, "ring use", text(s.ringUse));
    const factors = asObj(s.ringFactors);
    for (const r of ["top", "second", "oil"]) put(flat, `${RINGS[r]} gap factor`, text(factors[r]));
    const cam = asObj(s.cam);
    const CAM: [string, string][] = [
      ["intakeOpenBtdc", "intake opens (BTDC)"],
      ["intakeCloseAbdc", "intake closes (ABDC)"],
      ["exhaustOpenBbdc", "exhaust opens (BBDC)"],
      ["exhaustCloseAtdc", "exhaust closes (ATDC)"],
      ["installCentreline", "install at intake centreline"],
    ];
    for (const [k, label] of CAM) put(flat, label, withUnit(cam[k], "°"));
    const spring = asObj(s.spring);
    const sl = text(s.loadUnit) ?? load;
    const rate = sl === undefined ? undefined : sl === "lb" ? "lb/in" : "N/mm";
    put(flat, "spring installed height", withUnit(spring.installedHeight, l));
    put(flat, "spring rate", withUnit(spring.rate, rate));
    put(flat, "spring solid height", withUnit(spring.solidHeight, l));
    put(flat, "valve lift", withUnit(spring.lift, l));
    put(flat, "seat load, smallest", withUnit(spring.seatLoadMin, sl));
    put(flat, "seat load, largest", withUnit(spring.seatLoadMax, sl));
    const clearance = asObj(s.clearance);
    for (const kind of ["main", "rod"]) {
      const w = asObj(clearance[kind]);
      put(flat, `${kind} bearing clearance, smallest`, withUnit(w.min, l));
      put(flat, `${kind} bearing clearance, largest`, withUnit(w.max, l));
    }
    const c = asObj(s.compression);
    put(flat, "chamber volume", withUnit(c.chamberCc, "cc"));
    put(flat, "piston dish or dome", withUnit(c.pistonCc, "cc"));
    put(flat, "gasket bore", withUnit(c.gasketBore, l));
    put(flat, "gasket thickness", withUnit(c.gasketThickness, l));
  } else if (section === "rings") {
    for (const row of rowsOf(data)) {
      const where = `cylinder ${text(row.cylinder)} ${RINGS[String(row.ring)] ?? String(row.ring)}`;
      const readings = Array.isArray(row.readings) ? (row.readings as unknown[]) : [];
      put(flat, where, withUnit(readings[readings.length - 1], len) ?? "listed");
      if (row.done === true) flat.set(`${where}\u0000done`, "done");
    }
  } else if (section === "tdc") {
    const t = asObj(data);
    put(flat, "first stop", withUnit(t.firstStop, "°"));
    put(flat, "second stop", withUnit(t.secondStop, "°"));
  } else if (section === "cam") {
    const cam = asObj(data);
    put(flat, "checking lift", withUnit(cam.lift, len));
    const checks = Array.isArray(cam.checks) ? (cam.checks as Obj[]) : [];
    checks.forEach((check, i) => {
      put(flat, `check ${i + 1} opening side`, withUnit(check.openingSide, "°"));
      put(flat, `check ${i + 1} closing side`, withUnit(check.closingSide, "°"));
      if (check.final === true) flat.set(`check ${i + 1}\u0000final`, "final");
    });
  } else if (section === "springs") {
    for (const row of rowsOf(data)) {
      const where = `cylinder ${text(row.cylinder)} ${String(row.valve)} spring`;
      put(flat, `${where} installed height`, withUnit(row.installedHeight, len));
      put(flat, `${where} shim`, withUnit(row.shim, len));
      put(flat, `${where} load`, withUnit(row.seatLoad, load));
    }
  } else if (section === "clearances") {
    for (const row of rowsOf(data)) {
      const where = `${String(row.kind)} journal ${text(row.journal)}`;
      for (const [key, what] of [
        ["bore", "bearing bore"],
        ["journalDiameter", "journal diameter"],
      ] as const) {
        const grid = Array.isArray(row[key]) ? (row[key] as unknown[][]) : [];
        grid.forEach((side, i) =>
          (Array.isArray(side) ? side : []).forEach((v, j) =>
            put(
              flat,
              `${where} ${what} ${SIDES[i] ?? i + 1} ${DIRECTIONS[j] ?? j + 1}`,
              withUnit(v, len),
            ),
          ),
        );
      }
    }
  } else if (section === "deck") {
    for (const row of rowsOf(data)) {
      const where = `cylinder ${text(row.cylinder)}`;
      put(flat, `${where} deck clearance`, withUnit(row.deckClearance, len));
      put(flat, `${where} chamber volume`, withUnit(row.chamberCc, "cc"));
    }
  }
  return flat;
}

/** "0.46 → 0.50 mm" (or "-18 → -18.5°") when both carry the same unit, else both in full. */
function arrow(was: string, now: string): string {
  if (was.endsWith("°") && now.endsWith("°")) return `${was.slice(0, -1)} → ${now}`;
  const [wv, ...wu] = was.split(" ");
  const [nv, ...nu] = now.split(" ");
  const unit = nu.join(" ");
  return unit !== "" && unit === wu.join(" ") ? `${wv} → ${nv} ${unit}` : `${was} → ${now}`;
}

const FLAG_WORDS: Record<string, [on: string, off: string]> = {
  done: ["ticked done", "no longer ticked done"],
  final: ["marked crank turned twice, TDC re-checked", "no longer marked TDC re-checked"],
};

/** What changed between two saves of a section, one phrase per figure. */
function differences(before: Flat, after: Flat): string[] {
  const phrases: string[] = [];
  const keys = [...new Set([...before.keys(), ...after.keys()])];
  // New figures in the order of the new save; removed ones after them.
  keys.sort((a, b) => rank(after, a) - rank(after, b));
  for (const key of keys) {
    const was = before.get(key);
    const now = after.get(key);
    if (was === now) continue;
    const [where, flag] = key.split("\u0000") as [string, string | undefined];
    if (flag !== undefined) {
      const words = FLAG_WORDS[flag] ?? [flag, `not ${flag}`];
      phrases.push(`${where} ${now !== undefined ? words[0] : words[1]}`);
    } else if (was === undefined) phrases.push(`${where} ${now}`);
    else if (now === undefined) phrases.push(`${where} cleared (was ${was})`);
    else if (now === "listed") phrases.push(`${where} cleared (was ${was})`);
    else if (was === "listed") phrases.push(`${where} ${now}`);
    else phrases.push(`${where} ${arrow(was, now)}`);
  }
  return phrases;
}

function rank(after: Flat, key: string): number {
  const i = [...after.keys()].indexOf(key);
  return i < 0 ? Number.MAX_SAFE_INTEGER : i;
}

function sectionSentence(change: JobChange): string[] {
  const section = (change.subject ?? "") as BuildSection;
  const title = SECTION_TITLES[section];
  if (!title) return [];
  const after = asObj(change.after) as RecordedUnits & Obj;
  const units: RecordedUnits = { lengthUnit: after.lengthUnit, loadUnit: after.loadUnit };
  const phrases = differences(
    flatten(section, change.before, units),
    flatten(section, change.after, units),
  );
  if (phrases.length === 0) return [];
  const named = phrases.slice(0, MOST_NAMED);
  const more = phrases.length - named.length;
  return [`${title} saved: ${named.join("; ")}${more > 0 ? `; and ${more} more` : ""}`];
}

function requestSentence(change: JobChange): string[] {
  const before = asObj(change.before);
  const after = asObj(change.after);
  const what = `Request “${text(after.text) ?? text(before.text) ?? ""}”`;
  if (change.action === "create") return [`${what} written down`];
  if (before.state === after.state && before.note === after.note) return [];
  const note = text(after.note);
  if (after.state === "done") return [`${what} ticked done${note ? ` (${note})` : ""}`];
  if (after.state === "explained") return [`${what} not done: ${note ?? "no reason given"}`];
  return [`${what} opened again`];
}

/**
 * The sentences for one of the build record's entries in the job's change list, or null when
 * the entry is not the build record's (the caller describes it).
 *
 * @example describeBuildChange({ entity: "build_card", action: "issue", after: { revision: 2 }, … })
 *   // → ["Build record revision 2 issued"]
 */
export function describeBuildChange(change: JobChange): string[] | null {
  if (change.entity === "build_section") return sectionSentence(change);
  if (change.entity === "build_request") return requestSentence(change);
  const after = asObj(change.after);
  const revision = text(after.revision) ?? "";
  if (change.entity === "build_card") return [`Build record revision ${revision} issued`];
  const to = text(after.to);
  if (change.action === "email-build-record")
    return [`Build record revision ${revision} e-mailed${to ? ` to ${to}` : ""}`];
  if (change.action === "email-build-record-failed") {
    const status = text(after.status);
    return [
      `Build record revision ${revision} e-mail${to ? ` to ${to}` : ""} not sent${status ? ` (${status})` : ""}`,
    ];
  }
  return null;
}
