import js from "@eslint/js";
import tseslint from "typescript-eslint";

// Layer rules. `no-restricted-imports` options do not merge across config objects, so each group
// of files gets one list, composed from these pieces.
const noDbInternals = {
  regex: "^(?!@/lib/db$).*(^|/)lib/db(/|$)",
  message: "Reach the data layer through its barrel: import from \"@/lib/db\" (no module below it, no relative path).",
};
const noRelativeDbFromLib = {
  regex: "^\\.{1,2}/(\\.\\./)*db(/|$)",
  message: "Reach the data layer through its barrel: import from \"@/lib/db\".",
};
const noDbInComponents = {
  regex: "(^|/)lib/db(/|$)",
  message: "Components get their data as props from the page; they never read the database (lib/db).",
};
const noPrisma = { group: ["@prisma/*", "**/generated/client", "**/generated/client/*", "**/generated-pg/client", "**/generated-pg/client/*"], message: "Only lib/db uses Prisma." };
const noDbAbove = {
  regex: "^(@/|(\\.\\./)+)(lib/)?(auth|http|jobs|views|export)(/|$)|^@/(app|components)(/|$)",
  message: "lib/db is the bottom layer: it never imports lib/auth, lib/http, lib/jobs, lib/views, lib/export, app or components.",
};
const pure = {
  group: ["next", "next/*", "react", "react-dom", "@prisma/*", "@/lib/db", "@/lib/db/*", "**/lib/db/**", "server-only"],
  message: "lib/kinematics, lib/geometry and lib/analysis are pure: no Next, React or database imports.",
};
const restrict = (...patterns) => ({ "no-restricted-imports": ["error", { patterns }] });

export default tseslint.config(
  { ignores: ["node_modules/**", ".next/**", "dist/**", "lib/db/generated/**", "lib/db/generated-pg/**", "data/**", "next-env.d.ts", "test-results/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/no-non-null-assertion": "off",
    },
  },
  { files: ["app/**", "scripts/**", "cli/**", "bench/**", "shared/**", "seed-data/**"], rules: restrict(noDbInternals, noPrisma) },
  { files: ["components/**"], rules: restrict(noDbInComponents, noPrisma) },
  { files: ["lib/**"], ignores: ["lib/db/**"], rules: restrict(noDbInternals, noRelativeDbFromLib, noPrisma) },
  { files: ["lib/kinematics/**", "lib/geometry/**", "lib/analysis/**"], rules: restrict(pure) },
  { files: ["lib/db/**"], rules: restrict(noDbAbove) },
  {
    files: ["scripts/**/*.mjs", "*.mjs"],
    languageOptions: { globals: { process: "readonly", console: "readonly", URL: "readonly", setTimeout: "readonly", clearTimeout: "readonly", fetch: "readonly" } },
  },
);
