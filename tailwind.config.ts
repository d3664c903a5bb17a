import type { Config } from "tailwindcss";

// One accent (tide teal) on warm neutrals; status colours always travel with a word and a shape.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        accent: { 50: "#eefbf8", 100: "#d3f3ec", 200: "#a8e6da", 500: "#1f9e89", 600: "#15806f", 700: "#136659", 800: "#13524a" },
        ink: { DEFAULT: "#1c1f1e", soft: "#4a504e", faint: "#7b827f" },
        paper: { DEFAULT: "#f6f5f2", raised: "#ffffff", sunk: "#ecebe6", line: "#dcdad3" },
        ok: "#2f7d4f",
        warn: "#a45d00",
        bad: "#b42318",
        held: "#4b5bb3",
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
    },
  },
};
export default config;
