import type { Config } from "tailwindcss";

// Sitecue's design tokens, defined once. Trade-kind colours are decoration only:
// every use pairs them with a text label (never colour alone).
export default {
  theme: {
    extend: {
      colors: {
        paper: "#F5F2EA",
        card: "#FFFDF8",
        rule: "#E2DCCF",
        "rule-strong": "#C9C1B0",
        ink: "#1E2329",
        "ink-soft": "#5B6168",
        accent: { DEFAULT: "#1F5F8B", strong: "#174A6D", wash: "#E6EEF4" },
        ok: { DEFAULT: "#2F7A4B", wash: "#E7F1EA" },
        // #B7791F is too light for small text on paper (3.3:1); text uses wait-ink.
        wait: { DEFAULT: "#B7791F", ink: "#8A5A14", wash: "#F7EEDD" },
        risk: { DEFAULT: "#B23A3A", wash: "#F6E5E3" },
        trade: {
          workshop: "#1F5F8B",
          plasterer: "#8A6A4F",
          decorator: "#6C4E9A",
          electrician: "#C08A00",
          flooring: "#3E7C7C",
          plumber: "#2D6FB0",
          other: "#6B7280",
        },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ['"IBM Plex Mono"', "ui-monospace", "monospace"],
      },
      borderRadius: {
        DEFAULT: "4px",
      },
      maxWidth: {
        page: "72rem",
      },
    },
  },
} satisfies Config;
