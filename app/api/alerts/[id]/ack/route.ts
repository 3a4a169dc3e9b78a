import { route, runCommand, runningFleet, TesseraError } from "@/server/facade";

export const dynamic = "force-dynamic";

export const POST = route({ role: "operator", surface: "ackAlert" }, async ({ params, user }) => {
  const alertId = Number(params.id);
  if (!Number.isInteger(alertId) || alertId <= 0) throw new TesseraError("bad_request", "ackAlert", `Alert id "${params.id}" is not a positive integer.`);
  return runCommand(runningFleet(), "ackAlert", { alertId }, user!);
});
