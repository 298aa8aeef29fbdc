"use client";

import { useEffect } from "react";
import { registerServiceWorker } from "@/lib/client/service-worker";

/** Registers the offline worker once per page load; renders nothing and never throws. */
export function ServiceWorkerRegistration() {
  useEffect(() => {
    void registerServiceWorker();
  }, []);
  return null;
}
