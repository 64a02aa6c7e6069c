/** Ringland's design tokens: a shop notebook — warm paper, graphite ink, thin rules. */
const token = (name) => `rgb(var(--rl-${name}) / <alpha-value>)`;

export default {
  content: ["./src/**/*.{astro,html,ts,tsx,md}"],
  darkMode: "class",
  theme: {
    extend: {
      colors: {
        paper: token("paper"),
        sheet: token("sheet"),
        ink: token("ink"),
        pencil: token("pencil"),
        rule: token("rule"),
        spruce: token("spruce"),
        brass: token("brass"),
        oxide: token("oxide"),
        focus: token("focus"),
      },
      fontFamily: {
        sans: ["Barlow", "system-ui", "sans-serif"],
      },
      fontSize: {
        base: ["1.0625rem", { lineHeight: "1.55" }],
      },
      borderWidth: { hair: "1px" },
      maxWidth: { page: "76rem" },
      spacing: { thumb: "3.25rem" },
    },
  },
  plugins: [],
};
