import type { Config } from "tailwindcss";

/**
 * Airtally's design tokens. High contrast for bright plant rooms and dim ceilings,
 * one accent colour for actions, status never told by colour alone.
 */
const config: Config = {
  content: [],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: "#111a22", soft: "#2e3b47", muted: "#52606d" },
        paper: { DEFAULT: "#f6f7f4", raised: "#ffffff", sunk: "#e9ece6" },
        line: { DEFAULT: "#c5ccc4", strong: "#8a958c" },
        accent: { DEFAULT: "#0d5c8c", strong: "#083f61", soft: "#dbeaf4" },
        ok: { DEFAULT: "#1d6b3a", soft: "#dcefe2" },
        caution: { DEFAULT: "#8a5a00", soft: "#fbefd2" },
        fault: { DEFAULT: "#a3261b", soft: "#f9e0dc" },
      },
      fontFamily: {
        sans: ["var(--font-barlow)", "system-ui", "sans-serif"],
      },
      fontSize: {
        // A compact scale: body 17 px reads at arm's length on a tablet.
        xs: ["0.8125rem", { lineHeight: "1.15rem" }],
        sm: ["0.9375rem", { lineHeight: "1.35rem" }],
        base: ["1.0625rem", { lineHeight: "1.55rem" }],
        lg: ["1.25rem", { lineHeight: "1.75rem" }],
        xl: ["1.5rem", { lineHeight: "2rem" }],
        "2xl": ["1.875rem", { lineHeight: "2.3rem" }],
        "3xl": ["2.375rem", { lineHeight: "2.75rem" }],
      },
      spacing: {
        // Minimum touch target (44 px) and the grid gutter.
        touch: "2.75rem",
        gutter: "1.25rem",
      },
      borderRadius: {
        card: "0.375rem",
      },
    },
  },
};

export default config;
