// ESLint: the TypeScript rules (typescript-eslint, without type information so the run stays a few
// seconds) and the React hooks rules, plus the engine's boundary, which app/engine/architecture.test.ts
// also checks. Run by `npm run lint` and by `npm test` as a stage of its own.
import { defineConfig, globalIgnores } from "eslint/config";
import reactHooks from "eslint-plugin-react-hooks";
import tseslint from "typescript-eslint";

export default defineConfig([
  globalIgnores(["build/", ".react-router/", "tests/bench/peer/build/", "tests/bench/peer/.react-router/", "node_modules/", "drizzle/", "public/", "test-results/", "app/engine/wasm/dense-lu.ts"]),
  tseslint.configs.recommended,
  {
    files: ["**/*.{ts,tsx}"],
    rules: {
      // Names that are deliberately unused start with "_" (a destructured field left out of a spread).
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none", ignoreRestSiblings: true }],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
    },
  },
  {
    files: ["app/**/*.tsx", "app/components/**/*.ts", "app/charts/**/*.ts"],
    ...reactHooks.configs.flat.recommended,
    rules: {
      ...reactHooks.configs.flat.recommended.rules,
      // A note for the React Compiler, which this app does not use (TanStack Table's hooks are fine without it).
      "react-hooks/incompatible-library": "off",
    },
  },
  {
    // The engine is plain TypeScript: no framework, database, validation or Node module, nothing of the app.
    files: ["app/engine/**/*.ts"],
    ignores: ["app/engine/**/*.test.ts", "app/engine/wasm/build.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { regex: "^(react|react-router|drizzle-orm|pg|pg-boss|zod)(/|$)", message: "The engine imports no framework, database or validation package." },
            { regex: "^node:", message: "The engine imports no Node module: it runs in the browser, the command line and the workers alike." },
            { regex: "^~/", message: "The engine imports nothing from the app outside app/engine." },
          ],
        },
      ],
    },
  },
]);
