/** Main-thread tasks of a page over a time window, from a Chrome performance trace. */
import type { BrowserContext, Page } from "playwright-core";

interface TraceEvent {
  name: string;
  ph: string;
  dur?: number;
  /** Thread time: how long the thread actually ran, without the time the OS gave to others. */
  tdur?: number;
  pid: number;
  tid: number;
  args?: { name?: string };
}

/** One main-thread task: wall-clock duration and the renderer thread's own running time, in ms. */
export interface MainThreadTask {
  wallMs: number;
  threadMs: number;
}

/** Traces `page` for `ms` and returns each task of its busiest renderer main thread. */
export async function mainThreadTasks(context: BrowserContext, page: Page, ms: number): Promise<MainThreadTask[]> {
  const cdp = await context.newCDPSession(page);
  const events: TraceEvent[] = [];
  cdp.on("Tracing.dataCollected", (e) => events.push(...(e.value as unknown as TraceEvent[])));
  await cdp.send("Tracing.start", { categories: "toplevel,devtools.timeline,disabled-by-default-devtools.timeline", transferMode: "ReportEvents" });
  await page.waitForTimeout(ms);
  const done = new Promise((resolve) => cdp.once("Tracing.tracingComplete", resolve));
  await cdp.send("Tracing.end");
  await done;
  const mains = events.filter((e) => e.name === "thread_name" && e.args?.name === "CrRendererMain");
  const busiest = mains
    .map((m) => ({ m, n: events.filter((e) => e.pid === m.pid && e.tid === m.tid && e.name === "RunTask").length }))
    .sort((a, b) => b.n - a.n)[0];
  return events
    .filter((e) => e.name === "RunTask" && e.ph === "X" && e.pid === busiest.m.pid && e.tid === busiest.m.tid)
    .map((e) => ({ wallMs: (e.dur ?? 0) / 1000, threadMs: (e.tdur ?? e.dur ?? 0) / 1000 }));
}
