import js from "@eslint/js";
import nextPlugin from "@next/eslint-plugin-next";
import reactHooks from "eslint-plugin-react-hooks";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: [".next/**", "node_modules/**", "data/**", "test-results/**", "next-env.d.ts"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    plugins: { "@next/next": nextPlugin, "react-hooks": reactHooks },
    rules: {
      ...nextPlugin.configs.recommended.rules,
      ...nextPlugin.configs["core-web-vitals"].rules,
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "warn",
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_" },
      ],
      "@typescript-eslint/no-explicit-any": "error",
    },
  },
  {
    // The calculation cores stay pure: no framework, database, file system or environment.
    files: ["lib/balance/**/*.ts", "lib/assembly/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["next", "next/*", "react", "react-dom", "kysely", "better-sqlite3"],
              message: "lib/balance and lib/assembly are pure.",
            },
            {
              group: ["fs", "node:*", "@/db/*", "@/db", "@/app/*", "@/components/*"],
              message: "lib/balance and lib/assembly are pure.",
            },
          ],
        },
      ],
      "no-restricted-properties": [
        "error",
        {
          object: "process",
          property: "env",
          message: "The calculation cores read no environment.",
        },
      ],
      "no-restricted-globals": ["error", "process"],
    },
  },
  {
    // Migrations are frozen in time and take Kysely<any> by design.
    files: ["migrations/**/*.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
);
