// What to tell the grower when the camera will not start. getUserMedia rejects with a DOMException whose
// `name` says why (W3C Media Capture and Streams, getUserMedia error names); typed entry always still works.

export type CameraTrouble = "denied" | "absent" | "busy" | "insecure" | "failed";

export interface CameraTroubleText {
  kind: CameraTrouble;
  title: string;
  text: string;
}

const texts: Record<CameraTrouble, Omit<CameraTroubleText, "kind">> = {
  denied: {
    title: "The camera is blocked for Rimebook",
    text: "To scan labels, allow the camera for this site in your browser's site settings (the lock or info sign next to the address), then reload this page. Until then, type the code printed under the QR code.",
  },
  absent: {
    title: "No camera found",
    text: "This device has no camera Rimebook can use. Type the code printed under the QR code instead.",
  },
  busy: {
    title: "The camera is busy",
    text: "Another app or tab is using the camera. Close it and reload this page, or type the code printed under the QR code.",
  },
  insecure: {
    title: "The camera needs a secure connection",
    text: "Browsers only share the camera with pages opened over https. Type the code printed under the QR code instead.",
  },
  failed: {
    title: "The camera did not start",
    text: "Reload the page to try again, or type the code printed under the QR code.",
  },
};

export function classifyCameraError(error: unknown): CameraTrouble {
  const name = error && typeof error === "object" && "name" in error ? String((error as { name: unknown }).name) : "";
  switch (name) {
    case "NotAllowedError":
    case "PermissionDeniedError": // older Chrome
    case "SecurityError":
      return "denied";
    case "NotFoundError":
    case "DevicesNotFoundError": // older Chrome
    case "OverconstrainedError":
      return "absent";
    case "NotReadableError":
    case "TrackStartError": // older Chrome
    case "AbortError":
      return "busy";
    default:
      return "failed";
  }
}

export function describeCameraTrouble(kind: CameraTrouble): CameraTroubleText {
  return { kind, ...texts[kind] };
}
