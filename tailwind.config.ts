import type { Config } from "tailwindcss";

// Our own palette: graphite for text and frames, brass for the one action a screen is about,
// and plain signal colours (within band, machine it, replace it) that a machinist reads at arm's length.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        graphite: {
          50: "#f5f6f7",
          100: "#e6e8eb",
          200: "#cdd1d6",
          300: "#a9b0b8",
          400: "#7d8793",
          500: "#5c6673",
          600: "#48505b",
          700: "#373d46",
          800: "#262a31",
          900: "#17191d",
        },
        brass: {
          50: "#fbf7ec",
          100: "#f4e9c8",
          300: "#dcc17a",
          500: "#b8902f",
          600: "#9a7524",
          700: "#7a5b1d",
        },
        within: "#2f7d4f",
        machine: "#8a4b05",
        replace: "#b3261e",
      },
      fontFamily: {
        sans: ["var(--font-plex-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-plex-mono)", "ui-monospace", "monospace"],
      },
    },
  },
};

export default config;
