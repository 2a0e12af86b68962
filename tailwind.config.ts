import type { Config } from "tailwindcss";

// Trenchbook's own tokens: soil and root tones, a field green for actions, amber for caution and a
// deep red reserved for injury. Every text/background pair used in the app meets WCAG AA (4.5:1),
// and the field screens use the larger type steps for reading in sunlight.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./lib/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        soil: {
          50: "#faf7f2",
          100: "#f2ebdf",
          200: "#e2d5bf",
          300: "#c9b493",
          500: "#8a6d45",
          700: "#5a4529",
          900: "#2a2016",
        },
        sprout: {
          50: "#eef6ee",
          100: "#d5ead6",
          500: "#3d8a4a",
          700: "#245c30",
          900: "#143a1c",
        },
        caution: { 50: "#fff6e5", 500: "#c77700", 700: "#8a4b00" },
        burn: { 50: "#fdeceb", 500: "#c8321f", 700: "#8f1d10" },
        water: { 50: "#e8f2f9", 500: "#2a74a8", 700: "#174f78" },
      },
      fontFamily: {
        sans: ["'Public Sans Variable'", "system-ui", "sans-serif"],
      },
      fontSize: {
        // A 1.2 ratio from an 18 px base: comfortable at arm's length outdoors.
        xs: ["0.8125rem", { lineHeight: "1.25rem" }],
        sm: ["0.9375rem", { lineHeight: "1.4rem" }],
        base: ["1.125rem", { lineHeight: "1.65rem" }],
        lg: ["1.35rem", { lineHeight: "1.9rem" }],
        xl: ["1.62rem", { lineHeight: "2.1rem" }],
        "2xl": ["1.944rem", { lineHeight: "2.4rem" }],
        "3xl": ["2.333rem", { lineHeight: "2.8rem" }],
      },
      spacing: {
        tap: "3rem",
        gutter: "1.25rem",
      },
      borderRadius: {
        card: "0.875rem",
      },
    },
  },
};

export default config;
