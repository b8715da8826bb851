import type { Config } from "tailwindcss";

/**
 * Lotwise's look: an instrument bench at night. Deep blue-grey "ink" surfaces, warm "paper"
 * text, one copper "signal" accent for what can be acted on, plus "pass" and "fault" for
 * outcomes. Inter for the interface, JetBrains Mono for numbers, values and code.
 */
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: {
          50: "#eef1f5",
          100: "#d9dfe8",
          200: "#b4bfcf",
          300: "#8c9bb1",
          400: "#6b7c95",
          500: "#53637b",
          600: "#414f64",
          700: "#323e50",
          800: "#252f3e",
          900: "#1a222e",
          950: "#111720",
        },
        paper: {
          50: "#fbf8f2",
          100: "#f4eee2",
          200: "#e8dec9",
          300: "#d6c7a8",
        },
        signal: {
          200: "#f6d3a4",
          300: "#f0b46a",
          400: "#e8973f",
          500: "#d27a26",
          600: "#b0611b",
          700: "#8a4b17",
        },
        pass: {
          300: "#8fd6b4",
          400: "#5cc394",
          500: "#37a676",
          900: "#143a2b",
        },
        fault: {
          300: "#f3a29a",
          400: "#eb7a6f",
          500: "#d9564a",
          900: "#4a1c19",
        },
      },
      fontFamily: {
        sans: ["Inter", "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ["JetBrains Mono", "ui-monospace", "SFMono-Regular", "Menlo", "monospace"],
      },
      boxShadow: {
        bench: "0 1px 0 0 rgb(255 255 255 / 0.04) inset, 0 8px 24px -12px rgb(0 0 0 / 0.6)",
      },
    },
  },
} satisfies Config;
