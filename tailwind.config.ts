import type { Config } from "tailwindcss";

/** Quell's palette and type (see DEVELOPERS.md, "Look and words"). Loaded from app/globals.css with @config. */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: "#F7F5F0",
        hairline: "#E2DED5",
        ink: { DEFAULT: "#1C2430", muted: "#5B6472" },
        signal: { DEFAULT: "#0F766E", dark: "#0B5E58", light: "#CCE7E4" },
        verdict: { pass: "#15803D", warn: "#B45309", fail: "#B91C1C" },
        trace: {
          blue: "#0072B2",
          vermilion: "#D55E00",
          green: "#009E73",
          purple: "#CC79A7",
          orange: "#E69F00",
          sky: "#56B4E9",
          yellow: "#F0E442",
          black: "#000000",
        },
      },
      fontFamily: {
        sans: ["'Inter Variable'", "system-ui", "sans-serif"],
        mono: ["'JetBrains Mono Variable'", "ui-monospace", "monospace"],
      },
    },
  },
};

export default config;
