import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { RobotPage } from "@/components/roster/RobotPage";
import { isTesseraError, requirePageRole, robotDetail, robotSettings, runningFleet } from "@/server/facade";

export const metadata: Metadata = { title: "Robot" };

export default async function Page({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageRole("viewer", `/roster/${encodeURIComponent(id)}`);
  try {
    const [detail, settings] = await Promise.all([robotDetail(id), robotSettings(id)]);
    const { holdBelow, releaseAbove } = runningFleet().config;
    return <RobotPage initial={detail} settings={settings} canEdit={user.role === "admin"} levels={{ holdBelow, releaseAbove }} />;
  } catch (err) {
    if (isTesseraError(err) && err.type === "not_found") notFound();
    throw err;
  }
}
