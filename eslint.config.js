// Lint rules: eslint's and typescript-eslint's recommended sets, plus the project's own rule that
// library code draws randomness only from a seeded RandomStream made for a registered purpose.
import js from "@eslint/js";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: ["dist/", "node_modules/", "reports/", "coverage/"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { process: "readonly", console: "readonly", URL: "readonly" } },
    rules: {
      "@typescript-eslint/no-non-null-assertion": "off",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["src/**/*.ts"],
    rules: {
      "no-restricted-properties": [
        "error",
        { object: "Math", property: "random", message: "Use a seeded RandomStream (src/random.ts)." },
      ],
      "no-console": "error",
      "no-restricted-syntax": [
        "error",
        {
          selector: "NewExpression[callee.name='RandomStream']",
          message: "Make streams with streamFor(seed, StreamPurpose.x, ...) so that each path starts with its purpose.",
        },
      ],
    },
  },
  { files: ["src/random.ts"], rules: { "no-restricted-syntax": "off" } },
);
