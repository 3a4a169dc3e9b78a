// The lint config's main job is the fence between layers (ARCHITECTURE.md, "Folders").
import js from "@eslint/js";
import tseslint from "typescript-eslint";

const fence = (patterns, message) => ({
  "no-restricted-imports": ["error", { patterns: patterns.map((group) => ({ group: [group], message })) }],
});

const APP_LAYERS = ["**/app/**", "**/server/**", "**/db/**", "**/components/**", "**/robots/**", "**/simulators/**", "@/*"];
const FRAMEWORKS = ["react", "react-*", "next", "next/*", "next-auth", "next-auth/*", "socket.io", "socket.io-client", "drizzle-orm", "drizzle-orm/*", "mysql2", "mysql2/*", "pino", "node:*", "fs", "path", "child_process"];

export default tseslint.config(
  { ignores: ["node_modules/**", ".next/**", ".data/**", "next-env.d.ts", "db/migrations/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["lib/**/*.ts"],
    ignores: ["lib/**/*.test.ts"],
    rules: fence([...APP_LAYERS, ...FRAMEWORKS], "lib/ is pure: it imports nothing of the app, server, database, React or Node I/O."),
  },
  {
    files: ["robots/**/*.ts", "simulators/**/*.ts"],
    ignores: ["**/*.test.ts"],
    rules: fence(["**/app/**", "**/server/**", "**/db/**", "**/components/**", "react", "next", "next/*", "drizzle-orm", "drizzle-orm/*"], "robots/ and simulators/ use lib/ (and robots/) only."),
  },
  {
    files: ["db/**/*.ts"],
    rules: fence(["next", "next/*", "next-auth", "next-auth/*", "react", "**/app/**", "**/server/**", "**/components/**"], "db/ never imports Next, React or the server."),
  },
  {
    files: ["components/**/*.{ts,tsx}"],
    rules: fence(["**/server/**", "**/db/**", "@/server/*", "@/db/*", "drizzle-orm", "mysql2", "pino"], "components/ use lib/ types and helpers only; data comes through props or the client."),
  },
  {
    files: ["server/**/*.ts"],
    rules: fence(["**/app/**", "**/components/**", "@/app/*", "@/components/*"], "server/ never imports pages or components."),
  },
);
