import type { Page } from "@playwright/test";

// Chromium has no serial port to emulate: the page gets a stand-in `navigator.serial` whose port
// streams what the test feeds it. Like the browser, it remembers a port once picked: from then on
// `getPorts()` lists it on every page of the origin (kept in localStorage), without the picker.
declare global {
  interface Window {
    __scale: {
      feed: (text: string) => void;
      /** The options of each open(), on this page. */
      opened: unknown[];
      written: number[][];
      /** How many times the port picker was shown, on this page. */
      picked: number;
    };
  }
}

/** Where the stand-in keeps "this origin may open the port" between pages and reloads. */
export const FAKE_SERIAL_GRANT_KEY = "e2e:fake-serial-granted";

export async function fakeSerialPort(page: Page) {
  await page.addInitScript((grantKey) => {
    let controller: ReadableStreamDefaultController<Uint8Array> | null = null;
    const state = {
      opened: [] as unknown[],
      written: [] as number[][],
      picked: 0,
      feed: (text: string) => controller?.enqueue(new TextEncoder().encode(text)),
    };
    const port = {
      readable: null as ReadableStream<Uint8Array> | null,
      writable: null as WritableStream<Uint8Array> | null,
      async open(options: unknown) {
        state.opened.push(options);
        port.readable = new ReadableStream<Uint8Array>({
          start(c) {
            controller = c;
          },
        });
        port.writable = new WritableStream<Uint8Array>({
          write(chunk) {
            state.written.push([...chunk]);
          },
        });
      },
      async close() {
        port.readable = null;
        port.writable = null;
      },
      // An invented USB-serial adapter's ids.
      getInfo: () => ({ usbVendorId: 0x1a2b, usbProductId: 0x0c0d }),
    };
    const granted = () => window.localStorage.getItem(grantKey) === "yes";
    Object.defineProperty(window, "__scale", { value: state });
    Object.defineProperty(navigator, "serial", {
      configurable: true,
      value: {
        requestPort: async () => {
          state.picked += 1;
          window.localStorage.setItem(grantKey, "yes");
          return port;
        },
        getPorts: async () => (granted() ? [port] : []),
        addEventListener() {},
        removeEventListener() {},
      },
    });
  }, FAKE_SERIAL_GRANT_KEY);
}

/** Sends what the scale prints, chunk by chunk, a little apart. */
export const feedScale = (page: Page, ...chunks: string[]) =>
  page.evaluate(async (parts) => {
    for (const part of parts) {
      window.__scale.feed(part);
      await new Promise((r) => setTimeout(r, 20));
    }
  }, chunks);
