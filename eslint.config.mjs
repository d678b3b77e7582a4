import js from "@eslint/js";
import tseslint from "typescript-eslint";

const pureRestrictions = {
  patterns: [
    { group: ["next", "next/*", "react", "react-dom", "@prisma/*", "@/lib/db", "@/lib/db/*", "**/lib/db/**", "server-only"], message: "lib/kinematics and lib/analysis are pure: no Next, React or database imports." },
  ],
};

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
  {
    files: ["lib/kinematics/**", "lib/analysis/**"],
    rules: { "no-restricted-imports": ["error", pureRestrictions] },
  },
  {
    files: ["app/**", "components/**"],
    rules: { "no-restricted-imports": ["error", { patterns: [{ group: ["@prisma/*", "**/lib/db/generated/**", "**/lib/db/generated-pg/**"], message: "Pages use lib/db, never Prisma directly." }] }] },
  },
  {
    files: ["scripts/**/*.mjs", "*.mjs"],
    languageOptions: { globals: { process: "readonly", console: "readonly", URL: "readonly", setTimeout: "readonly", clearTimeout: "readonly", fetch: "readonly" } },
  },
);
