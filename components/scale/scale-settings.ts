/** How one bench PC talks to its scale; kept in this browser's localStorage. */
export type ScaleSettings = {
  baudRate: number;
  dataBits: 7 | 8;
  parity: "none" | "even" | "odd";
  stopBits: 1 | 2;
  flowControl: "none" | "hardware";
  /** Sent on "Ask the scale for a reading", written with \r, \n, \t or \xHH escapes: "P\r\n". */
  printCommand: string;
  /** Press Enter for the machinist after a stable reading goes into the box. */
  autoAccept: boolean;
  /**
   * The USB ids of the port last opened here (what `SerialPort.getInfo()` gave), to find it among
   * the ports this browser already has permission for; null before the first connection.
   */
  lastPort: { usbVendorId?: number; usbProductId?: number } | null;
};

export const BAUD_RATES = [1200, 2400, 4800, 9600, 19200, 38400, 57600, 115200] as const;

// 9600 baud, 8 data bits, no parity, 1 stop bit: the setting most scales leave the factory with.
export const DEFAULT_SCALE_SETTINGS: ScaleSettings = {
  baudRate: 9600,
  dataBits: 8,
  parity: "none",
  stopBits: 1,
  flowControl: "none",
  printCommand: "",
  autoAccept: false,
  lastPort: null,
};

export const SCALE_SETTINGS_KEY = "counterpoise.scale-settings";

/** The settings saved on this PC, any missing or damaged value back at its default. */
export function loadScaleSettings(storage: Pick<Storage, "getItem"> | undefined): ScaleSettings {
  let saved: Partial<Record<keyof ScaleSettings, unknown>> = {};
  try {
    const text = storage?.getItem(SCALE_SETTINGS_KEY);
    if (text) saved = JSON.parse(text) as typeof saved;
  } catch {
    saved = {};
  }
  const d = DEFAULT_SCALE_SETTINGS;
  const oneOf = <T>(value: unknown, allowed: readonly T[], fallback: T): T =>
    allowed.includes(value as T) ? (value as T) : fallback;
  return {
    baudRate: oneOf(saved.baudRate, BAUD_RATES, d.baudRate),
    dataBits: oneOf(saved.dataBits, [7, 8] as const, d.dataBits),
    parity: oneOf(saved.parity, ["none", "even", "odd"] as const, d.parity),
    stopBits: oneOf(saved.stopBits, [1, 2] as const, d.stopBits),
    flowControl: oneOf(saved.flowControl, ["none", "hardware"] as const, d.flowControl),
    printCommand:
      typeof saved.printCommand === "string" ? saved.printCommand.slice(0, 40) : d.printCommand,
    autoAccept: typeof saved.autoAccept === "boolean" ? saved.autoAccept : d.autoAccept,
    lastPort: portIds(saved.lastPort),
  };
}

/** USB ids kept as whole numbers from 0 to 0xFFFF; anything else is forgotten. */
function portIds(value: unknown): ScaleSettings["lastPort"] {
  if (typeof value !== "object" || value === null) return null;
  const id = (v: unknown) =>
    typeof v === "number" && Number.isInteger(v) && v >= 0 && v <= 0xffff ? v : undefined;
  const { usbVendorId, usbProductId } = value as Record<string, unknown>;
  return { usbVendorId: id(usbVendorId), usbProductId: id(usbProductId) };
}

/**
 * Of the ports this browser already has permission for, the one to reconnect: the one with the
 * remembered USB ids, else the only one there is; null when there is none or no way to choose.
 */
export function rememberedPort<P extends { getInfo?: () => SerialPortInfo }>(
  ports: readonly P[],
  last: ScaleSettings["lastPort"],
): P | null {
  if (last && last.usbVendorId !== undefined) {
    const same = ports.find((p) => {
      const info = p.getInfo?.() ?? {};
      return info.usbVendorId === last.usbVendorId && info.usbProductId === last.usbProductId;
    });
    if (same) return same;
  }
  return ports.length === 1 ? ports[0]! : null;
}

/** "4800 baud, 7 data bits, even parity, 1 stop bit": the settings as the scale's menu shows them. */
export function describePortSettings(s: ScaleSettings): string {
  return [
    `${s.baudRate} baud`,
    `${s.dataBits} data bits`,
    `${s.parity} parity`,
    `${s.stopBits} stop bit${s.stopBits === 1 ? "" : "s"}`,
    ...(s.flowControl === "hardware" ? ["hardware handshake"] : []),
  ].join(", ");
}

export function saveScaleSettings(
  storage: Pick<Storage, "setItem"> | undefined,
  settings: ScaleSettings,
) {
  try {
    storage?.setItem(SCALE_SETTINGS_KEY, JSON.stringify(settings));
  } catch {
    // A full or blocked storage only means the settings are asked again next time.
  }
}

/**
 * The print command as bytes: "P\r\n" typed with backslashes becomes P, CR, LF.
 * `null` when an escape is not one of \r, \n, \t, \\ or \xHH.
 */
export function encodePrintCommand(command: string): Uint8Array | null {
  const bytes: number[] = [];
  for (let i = 0; i < command.length; i += 1) {
    const ch = command[i]!;
    if (ch !== "\\") {
      const code = ch.charCodeAt(0);
      if (code > 0x7e) return null;
      bytes.push(code);
      continue;
    }
    const next = command[i + 1];
    i += 1;
    if (next === "r") bytes.push(13);
    else if (next === "n") bytes.push(10);
    else if (next === "t") bytes.push(9);
    else if (next === "\\") bytes.push(92);
    else if (next === "x" && /^[0-9a-f]{2}$/i.test(command.slice(i + 1, i + 3))) {
      bytes.push(parseInt(command.slice(i + 1, i + 3), 16));
      i += 2;
    } else return null;
  }
  return Uint8Array.from(bytes);
}
