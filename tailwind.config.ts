import forms from "@tailwindcss/forms";
import type { Config } from "tailwindcss";

// Peeksafe's palette: pine (brand and treatment), slate (holdout), and muted signal tones.
const pine = { 50: "#f1f7f4", 100: "#dcebe3", 200: "#b9d6c8", 300: "#8cbaa6", 400: "#5e9a82", 500: "#3f7e67", 600: "#2f6553", 700: "#285244", 800: "#224238", 900: "#1c3630", 950: "#0f1f1b" };

const config: Config = {
  darkMode: "class",
  content: [
    "./app/**/*.{ts,tsx}",
    "./components/**/*.{ts,tsx}",
    "./lib/**/*.{ts,tsx}",
    "./node_modules/@tremor/**/*.{js,ts,jsx,tsx}",
  ],
  theme: {
    transparent: "transparent",
    current: "currentColor",
    extend: {
      fontFamily: {
        sans: ["var(--font-sans)", "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      colors: {
        pine,
        tremor: {
          brand: { faint: pine[50], muted: pine[200], subtle: pine[400], DEFAULT: pine[600], emphasis: pine[800], inverted: "#ffffff" },
          background: { muted: "#f7f8f6", subtle: "#eef0ec", DEFAULT: "#ffffff", emphasis: "#374151" },
          border: { DEFAULT: "#dfe3dc" },
          ring: { DEFAULT: "#dfe3dc" },
          content: { subtle: "#8a969c", DEFAULT: "#5b6b73", emphasis: "#33434b", strong: "#1c2a33", inverted: "#ffffff" },
        },
        "dark-tremor": {
          brand: { faint: "#0f1f1b", muted: pine[900], subtle: pine[700], DEFAULT: pine[400], emphasis: pine[300], inverted: pine[950] },
          background: { muted: "#111a1d", subtle: "#18252a", DEFAULT: "#0d1417", emphasis: "#d1d5db" },
          border: { DEFAULT: "#26353b" },
          ring: { DEFAULT: "#26353b" },
          content: { subtle: "#6b7c84", DEFAULT: "#9aa9b0", emphasis: "#d4dde1", strong: "#eef3f5", inverted: "#000000" },
        },
      },
      boxShadow: {
        "tremor-input": "0 1px 2px 0 rgb(0 0 0 / 0.05)",
        "tremor-card": "0 1px 3px 0 rgb(0 0 0 / 0.08), 0 1px 2px -1px rgb(0 0 0 / 0.08)",
        "tremor-dropdown": "0 4px 6px -1px rgb(0 0 0 / 0.1), 0 2px 4px -2px rgb(0 0 0 / 0.1)",
        "dark-tremor-input": "0 1px 2px 0 rgb(0 0 0 / 0.05)",
        "dark-tremor-card": "0 1px 3px 0 rgb(0 0 0 / 0.1), 0 1px 2px -1px rgb(0 0 0 / 0.1)",
        "dark-tremor-dropdown": "0 4px 6px -1px rgb(0 0 0 / 0.1), 0 2px 4px -2px rgb(0 0 0 / 0.1)",
      },
      borderRadius: { "tremor-small": "0.375rem", "tremor-default": "0.5rem", "tremor-full": "9999px" },
      fontSize: {
        "tremor-label": ["0.75rem", { lineHeight: "1rem" }],
        "tremor-default": ["0.875rem", { lineHeight: "1.25rem" }],
        "tremor-title": ["1.125rem", { lineHeight: "1.75rem" }],
        "tremor-metric": ["1.875rem", { lineHeight: "2.25rem" }],
      },
    },
  },
  safelist: [
    {
      pattern:
        /^(bg-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
      variants: ["hover", "ui-selected"],
    },
    {
      pattern:
        /^(text-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
      variants: ["hover", "ui-selected"],
    },
    {
      pattern:
        /^(border-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
      variants: ["hover", "ui-selected"],
    },
    {
      pattern:
        /^(ring-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
    },
    {
      pattern:
        /^(stroke-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
    },
    {
      pattern:
        /^(fill-(?:slate|gray|zinc|neutral|stone|red|orange|amber|yellow|lime|green|emerald|teal|cyan|sky|blue|indigo|violet|purple|fuchsia|pink|rose|pine)-(?:50|100|200|300|400|500|600|700|800|900|950))$/,
    },
  ],
  plugins: [forms],
};

export default config;
