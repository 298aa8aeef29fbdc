"use client";

import { useEffect, useState } from "react";

/**
 * Placeholder id of a detail route's prerendered shell. A page at app/(farm)/x/[id] that wants to
 * open offline for any id exports generateStaticParams → [{ id: OFFLINE_SHELL_ID }], mentions this
 * constant (next.config.mjs precaches "/x/_" then), and reads its id with useRouteId.
 */
export const OFFLINE_SHELL_ID = "_";

/** The id from the route params, or from the address when the service worker served the "_" shell. */
export function useRouteId(paramId: string | undefined): string | undefined {
  const [id, setId] = useState(paramId === OFFLINE_SHELL_ID ? undefined : paramId);
  useEffect(() => {
    if (paramId !== OFFLINE_SHELL_ID) return setId(paramId);
    const last = window.location.pathname.split("/").filter(Boolean).pop();
    setId(last && last !== OFFLINE_SHELL_ID ? decodeURIComponent(last) : undefined);
  }, [paramId]);
  return id;
}
