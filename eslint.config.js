// ESLint flat config for Sitecue.
//
// What it enforces (see style.md "Dependency direction"):
//   - shared/ imports neither src/, server/ nor tests/;
//   - src/ and server/ never import each other;
//   - src/ never imports tests/; server/ may import tests/factories/ only (the demo seed
//     reuses the test builders); tests — tests/** and *.test.ts(x) beside the code — may
//     import anything;
//   - src/features/<a>/ never imports src/features/<b>/ (features meet in src/components,
//     src/lib; src/app composes them);
//   - no import cycles.
// Each rule is proven by a fixture it must reject: tests/lint/boundaries.test.ts.
//
// Formatting belongs to Prettier: only correctness rules here, no stylistic ones.
import js from "@eslint/js";
import { defineConfig, globalIgnores } from "eslint/config";
import boundaries from "eslint-plugin-boundaries";
import { createNodeResolver, importX } from "eslint-plugin-import-x";
import { createTypeScriptImportResolver } from "eslint-import-resolver-typescript";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import tseslint from "typescript-eslint";

const sourceExtensions = [".ts", ".tsx", ".js", ".mjs"];

// Boundaries element types. partialMatch: false anchors each pattern at the project root
// (boundaries/root-path), so e.g. server/modules/shared/ is never mistaken for shared/.
// Order matters: the first descriptor matching a path wins, so the specific ones come first.
const elements = [
  { type: "shared", pattern: "shared", partialMatch: false },
  { type: "server", pattern: "server", partialMatch: false },
  {
    type: "feature",
    pattern: "src/features/*",
    partialMatch: false,
    capture: ["feature"],
  },
  { type: "client", pattern: "src", partialMatch: false },
  { type: "test-factories", pattern: "tests/factories", partialMatch: false },
  { type: "tests", pattern: "tests", partialMatch: false },
];

const to = (...types) => types.map((type) => ({ to: { element: { type } } }));

// default "disallow": a local import between two known elements is an error unless a policy
// below allows it. Imports inside one element (e.g. within src/features/jobs, within server)
// are internal and not checked; packages (react, zod, node:*) are not local and not checked.
const boundaryPolicies = [
  {
    from: { element: { type: "shared" } },
    // nothing: shared/ only imports itself (internal) and packages
    disallow: to("server", "client", "feature", "tests", "test-factories"),
    message:
      "shared/ is pure TypeScript used by both sides: it must not import {{ to.element.path }}",
  },
  {
    from: { element: { type: "server" } },
    allow: to("shared", "test-factories"),
  },
  {
    from: { element: { type: "client" } },
    allow: to("shared", "feature"),
  },
  {
    from: { element: { type: "feature" } },
    allow: to("shared", "client"),
  },
  {
    from: { element: { type: "test-factories" } },
    allow: to("shared", "server", "tests"),
  },
  {
    from: { element: { type: "tests" } },
    allow: to("shared", "server", "client", "feature", "test-factories"),
  },
  {
    // unit tests beside the code (server/**/x.test.ts, shared/**/x.test.ts) are tests too
    from: { file: { categories: "test" } },
    allow: to(
      "shared",
      "server",
      "client",
      "feature",
      "tests",
      "test-factories",
    ),
  },
];

export default defineConfig([
  globalIgnores([
    "dist/",
    "node_modules/",
    ".data/",
    "tests/output/",
    // Deliberately broken code: linted only by tests/lint/boundaries.test.ts.
    "tests/lint/fixtures/",
  ]),

  {
    files: ["**/*.{js,mjs,cjs,ts,tsx}"],
    extends: [js.configs.recommended],
    languageOptions: {
      ecmaVersion: 2023,
      sourceType: "module",
      globals: globals.node,
    },
    rules: {
      "no-unused-vars": [
        "error",
        {
          argsIgnorePattern: "^_",
          caughtErrorsIgnorePattern: "^_",
          destructuredArrayIgnorePattern: "^_",
          ignoreRestSiblings: true,
        },
      ],
    },
  },

  // typescript-eslint recommended, without type information (fast: no program per file).
  {
    files: ["**/*.{ts,tsx}"],
    extends: [tseslint.configs.recommended],
    rules: {
      "@typescript-eslint/no-unused-vars": [
        "error",
        {
          argsIgnorePattern: "^_",
          caughtErrorsIgnorePattern: "^_",
          destructuredArrayIgnorePattern: "^_",
          ignoreRestSiblings: true,
        },
      ],
    },
  },

  // The client runs in the browser. Hooks live both in components (.tsx) and in the
  // endpoint modules (src/features/*/api/*.ts), so the hook rules cover both.
  {
    files: ["src/**/*.{ts,tsx}"],
    extends: [reactHooks.configs.flat.recommended],
    languageOptions: { globals: globals.browser },
  },

  // Plain Node ESM, run before tsx is available.
  {
    files: ["server/infra/bootstrap.mjs"],
    languageOptions: { globals: globals.node },
  },

  // Import boundaries and cycles, for every source file.
  {
    files: ["**/*.{js,mjs,ts,tsx}"],
    plugins: { boundaries, "import-x": importX },
    settings: {
      // eslint-plugin-boundaries resolves through eslint-module-utils: without a resolver
      // that knows .ts/.tsx every local import is "unresolved" and silently passes.
      // TypeScript resolver first (follows tsconfig, e.g. paths if they are ever added),
      // the node resolver with our extensions as the fallback. Same order for import-x below.
      "import/resolver": {
        typescript: { alwaysTryTypes: true },
        node: { extensions: sourceExtensions },
      },
      "boundaries/elements": elements,
      "boundaries/files": [{ category: "test", pattern: "**/*.test.{ts,tsx}" }],
      // import-x: parse .ts/.tsx with the TypeScript parser and resolve them; without these
      // no-cycle cannot follow a single import and reports nothing.
      "import-x/parsers": { "@typescript-eslint/parser": [".ts", ".tsx"] },
      "import-x/extensions": sourceExtensions,
      "import-x/resolver-next": [
        createTypeScriptImportResolver({ alwaysTryTypes: true }),
        createNodeResolver({ extensions: sourceExtensions }),
      ],
    },
    rules: {
      "boundaries/dependencies": [
        "error",
        { default: "disallow", policies: boundaryPolicies },
      ],
      // Type-only imports are erased at build time and are skipped by no-cycle.
      "import-x/no-cycle": ["error", { ignoreExternal: true }],
    },
  },
]);
