// One linter for the whole repository (run by `npm test` and CI). The formatter (Prettier) owns
// layout; these rules are about correctness and keeping functions small enough to review.
import js from "@eslint/js";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: ["node_modules/", "_site/", "_site.*/", ".cache/", "test-output/", "**/*.d.ts"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2023, sourceType: "module" },
    rules: {
      // A sizing stage or a view that needs more branches than this wants splitting.
      // ("modified": a switch counts once, so a lookup table written as a switch is not penalised).
      complexity: ["error", { max: 30, variant: "modified" }],
      "max-depth": ["error", 5],
      "max-params": ["error", 8],
      eqeqeq: ["error", "always"],
      "no-implicit-coercion": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/consistent-type-imports": "error",
      // Prettier folds code but not long strings or comments; this keeps those within the same width too.
      "max-len": ["error", { code: 120, ignoreUrls: true, ignoreRegExpLiterals: true }],
    },
  },
  {
    // Tests may poke at shapes loosely (hostile records are deliberately untyped).
    files: ["test/**/*.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off", "@typescript-eslint/no-non-null-assertion": "off" },
  },
  {
    // Test fixtures hold verbatim hostile and reference inputs whose long lines are part of the data.
    files: ["test/fixtures/**"],
    rules: { "max-len": "off" },
  },
  {
    // The site's own browser scripts (no bundler): they run in the page.
    files: ["site/assets/**/*.js"],
    languageOptions: { globals: { document: "readonly", window: "readonly", URLSearchParams: "readonly" } },
  },
  {
    files: ["**/*.js", "**/*.mjs", "**/*.cjs"],
    languageOptions: { globals: { process: "readonly", console: "readonly", URL: "readonly" } },
  },
);
