"use client";

import { useEffect, useState } from "react";

const STORAGE_KEY = "tessera-theme";

type Theme = "dark" | "light";

/** Switches the dark (default) and light themes by the `dark` class on <html>; the choice is kept in localStorage. */
export function ThemeToggle() {
  const [theme, setTheme] = useState<Theme>("dark");
  useEffect(() => {
    const stored = window.localStorage.getItem(STORAGE_KEY);
    if (stored === "light" || stored === "dark") setTheme(stored);
  }, []);
  useEffect(() => {
    document.documentElement.classList.toggle("dark", theme === "dark");
  }, [theme]);
  const next: Theme = theme === "dark" ? "light" : "dark";
  return (
    <button
      type="button"
      aria-label={`Switch to the ${next} theme`}
      title={`Switch to the ${next} theme`}
      onClick={() => {
        window.localStorage.setItem(STORAGE_KEY, next);
        setTheme(next);
      }}
      className="rounded-md border border-ink-700 px-2 py-1 text-xs text-ink-300 hover:border-ink-500 hover:text-ink-100"
    >
      {theme === "dark" ? "Light" : "Dark"}
    </button>
  );
}
