"use client";

import { useMutation } from "@tanstack/react-query";
import { useCallback } from "react";
import type { OpsCommand, OpsCommandName } from "@/lib/protocol";
import { restCommand, type SendCommand } from "./rest-commands";

type Variables = { name: Exclude<OpsCommandName, "watch">; payload: OpsCommand<Exclude<OpsCommandName, "watch">> };

/** Commands as TanStack Query mutations over the HTTP routes: the same role checks as every other client. */
export function useRestCommands(): SendCommand {
  const { mutateAsync } = useMutation({ mutationFn: ({ name, payload }: Variables) => restCommand(name, payload) });
  return useCallback<SendCommand>((name, payload) => mutateAsync({ name, payload } as Variables), [mutateAsync]);
}
