// Flat ESLint config. Kept as a dotfile so the repository's top level stays as the team agreed;
// `npm run lint` passes it explicitly.
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";
import drizzle from "eslint-plugin-drizzle";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", "node_modules/**", "data/**", "tests/artifacts/**", "next-env.d.ts", "drizzle/**"],
  },
  {
    plugins: { drizzle },
    rules: {
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "drizzle/enforce-delete-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
      "drizzle/enforce-update-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
      // Serials, notes and file names are shown as text: React escapes them unless told not to.
      "react/no-danger": "error",
      "no-restricted-syntax": [
        "error",
        {
          selector: "AssignmentExpression > MemberExpression.left[property.name=/^(innerHTML|outerHTML)$/]",
          message: "Set textContent instead: markup from records is shown as text.",
        },
        {
          selector: "CallExpression[callee.property.name=/^(insertAdjacentHTML|write|writeln)$/][callee.object.name=/^(document|.*[Ee]lement|el|node)$/]",
          message: "Build DOM nodes with text instead: markup from records is shown as text.",
        },
      ],
    },
  },
  {
    // UI code never talks to the ORM directly.
    files: ["app/**/*.tsx", "components/**/*.tsx"],
    rules: {
      "no-restricted-imports": ["error", { patterns: ["drizzle-orm", "drizzle-orm/*", "@/lib/db/client", "@/lib/db/schema"] }],
    },
  },
  {
    // The analysis engine stays free of framework and database imports.
    files: ["lib/analysis/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: ["next", "next/*", "react", "react-dom", "drizzle-orm", "drizzle-orm/*", "@/lib/db/*", "@/app/*", "@/components/*"] },
      ],
    },
  },
];

export default config;
