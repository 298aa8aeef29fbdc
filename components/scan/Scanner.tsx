"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useCallback, useEffect, useRef, useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import type { IScannerControls } from "@zxing/browser";
import { getLocalDb } from "@/lib/client/db";
import { loadFarmFetched } from "@/lib/client/meta";
import { formatBagCode, normalizeCrockford } from "@/lib/domain/bag-codes";
import { Button } from "@/components/ui/Button";
import { Field, Input } from "@/components/ui/Field";
import { classifyCameraError, describeCameraTrouble, type CameraTroubleText } from "./camera-trouble";
import { indexFarmCodes, lookUpScannedText, lookUpTypedCode, type CodeLookup, type FarmCodes } from "./code-entry";

// The scanner: rear camera, continuous QR decoding, the bag's check sheet as soon as a label is read.
// @zxing/browser is imported here, inside an effect, so only this screen downloads it.

type CameraState = { status: "starting" } | { status: "scanning" } | { status: "trouble"; trouble: CameraTroubleText };

export function Scanner() {
  const router = useRouter();
  const params = useSearchParams();
  const saved = params.get("saved");
  const videoRef = useRef<HTMLVideoElement>(null);
  const controlsRef = useRef<IScannerControls | null>(null);
  const [camera, setCamera] = useState<CameraState>({ status: "starting" });
  const [torch, setTorch] = useState({ available: false, on: false });
  const [notice, setNotice] = useState<{ text: string; calm?: boolean } | null>(null);
  const [typed, setTyped] = useState("");
  const [typedResult, setTypedResult] = useState<CodeLookup | null>(null);

  const codes = useLiveQuery(async () => indexFarmCodes(await getLocalDb().bags.toArray()), []);
  const fetched = useLiveQuery(() => loadFarmFetched(getLocalDb()), []);
  const codesRef = useRef<FarmCodes | undefined>(undefined);
  codesRef.current = codes;
  const fetchedRef = useRef(fetched);
  fetchedRef.current = fetched;
  /** Before the first fetch, "unknown" only means "not on this phone yet". */
  const explainUnknown = (r: CodeLookup): string =>
    r.kind === "unknown" && fetchedRef.current === false ? `${r.message} Your farm is still being fetched onto this phone; try again in a moment.` : "message" in r ? r.message : "";
  const lastTextRef = useRef<string>("");
  const leavingRef = useRef(false);
  // The bag just saved is usually still in front of the camera: it is not reopened until it has left the view.
  const justSavedRef = useRef<{ code: string | null; seenAt: number }>({ code: saved ? normalizeCrockford(saved) : null, seenAt: Date.now() });

  const openBag = useCallback(
    (bagId: string) => {
      if (leavingRef.current) return;
      leavingRef.current = true;
      controlsRef.current?.stop();
      router.push(`/check?bag=${encodeURIComponent(bagId)}`);
    },
    [router],
  );

  const onScanned = useCallback(
    (text: string) => {
      const farm = codesRef.current;
      if (!farm || leavingRef.current) return; // the phone store is still opening; the next frame will do
      const result = lookUpScannedText(text, farm);
      const justSaved = justSavedRef.current;
      if (result.kind === "found" && result.code === justSaved.code) {
        justSaved.seenAt = Date.now();
        if (lastTextRef.current !== text) setNotice({ text: `${formatBagCode(result.code)} was just saved. Point the camera at the next label.`, calm: true });
        lastTextRef.current = text;
        return;
      }
      if (result.kind === "found") return openBag(result.bagId);
      if (text === lastTextRef.current) return;
      lastTextRef.current = text;
      setNotice({ text: explainUnknown(result) });
    },
    [openBag],
  );

  useEffect(() => {
    let cancelled = false;
    let controls: IScannerControls | null = null;
    (async () => {
      if (!window.isSecureContext || !navigator.mediaDevices?.getUserMedia) {
        setCamera({ status: "trouble", trouble: describeCameraTrouble(window.isSecureContext ? "absent" : "insecure") });
        return;
      }
      try {
        const { BrowserQRCodeReader } = await import("@zxing/browser");
        if (cancelled || !videoRef.current) return;
        const reader = new BrowserQRCodeReader(undefined, { delayBetweenScanAttempts: 120, delayBetweenScanSuccess: 400 });
        controls = await reader.decodeFromConstraints(
          { audio: false, video: { facingMode: { ideal: "environment" } } },
          videoRef.current,
          (result) => {
            // Never throw back into zxing's loop: an exception there stops the scanning for good.
            try {
              if (result) onScanned(result.getText());
              else if (justSavedRef.current.code && Date.now() - justSavedRef.current.seenAt > 1500) justSavedRef.current.code = null;
            } catch (e) {
              console.error(e);
            }
          },
        );
        if (cancelled) {
          controls.stop();
          return;
        }
        controlsRef.current = controls;
        setCamera({ status: "scanning" });
        const track = (videoRef.current?.srcObject as MediaStream | null)?.getVideoTracks()[0];
        const caps = track?.getCapabilities?.() as (MediaTrackCapabilities & { torch?: boolean }) | undefined;
        setTorch({ available: Boolean(caps?.torch && controls.switchTorch), on: false });
      } catch (error) {
        if (!cancelled) setCamera({ status: "trouble", trouble: describeCameraTrouble(classifyCameraError(error)) });
      }
    })();
    return () => {
      cancelled = true;
      controls?.stop();
      controlsRef.current = null;
    };
  }, [onScanned]);

  async function toggleTorch() {
    const next = !torch.on;
    try {
      await controlsRef.current?.switchTorch?.(next);
      setTorch({ available: true, on: next });
    } catch {
      setTorch({ available: false, on: false });
      setNotice({ text: "The light could not be switched on for this camera." });
    }
  }

  function submitTyped(text: string) {
    if (!codes) return;
    const result = lookUpTypedCode(text, codes);
    setTypedResult(result);
    if (result.kind === "found") openBag(result.bagId);
  }

  const typedError = typedResult && typedResult.kind !== "found" ? explainUnknown(typedResult) : undefined;

  return (
    <div className="space-y-4">
      <header className="flex items-center justify-between gap-3">
        <h1 className="text-title font-bold text-glacier-800">Scan a bag label</h1>
        <Link href="/today" className="min-h-tap px-2 py-2 text-label font-semibold text-glacier-700 underline">
          Today&apos;s round
        </Link>
      </header>

      {saved ? (
        <p role="status" className="rounded-card border-l-4 border-moss-600 bg-moss-100 p-3 font-semibold text-moss-700" data-testid="saved-notice">
          ✓ Check saved for {formatBagCode(saved)}. Scan the next bag.
        </p>
      ) : null}

      <div className={camera.status === "trouble" ? "hidden" : "relative overflow-hidden rounded-card bg-ink"}>
        <video ref={videoRef} className="aspect-[4/3] w-full object-cover" muted playsInline aria-label="Camera view for scanning" />
        <div aria-hidden="true" className="pointer-events-none absolute inset-[12%] rounded-2xl border-4 border-dashed border-rime-100/80" />
        {camera.status === "starting" ? (
          <p className="absolute inset-x-0 bottom-3 text-center text-label font-semibold text-white">Starting the camera…</p>
        ) : (
          <p className="absolute inset-x-0 bottom-3 text-center text-label font-semibold text-white">Hold the label&apos;s QR code inside the frame</p>
        )}
      </div>

      {camera.status === "trouble" ? (
        <div className="rounded-card border-l-4 border-wheat-600 bg-wheat-100 p-4" role="alert" data-testid="camera-trouble">
          <p className="font-semibold text-ink">{camera.trouble.title}</p>
          <p className="text-label text-ink">{camera.trouble.text}</p>
        </div>
      ) : null}

      {torch.available ? (
        <Button tone="secondary" size="lg" className="w-full" aria-pressed={torch.on} onClick={toggleTorch}>
          {torch.on ? "Light off" : "Light on"}
        </Button>
      ) : null}

      <p
        aria-live="polite"
        className={notice ? `rounded-card p-3 font-semibold ${notice.calm ? "bg-rime-100 text-glacier-800" : "bg-ember-100 text-ember-700"}` : "sr-only"}
        data-testid="scan-notice"
      >
        {notice?.text ?? ""}
      </p>

      <form
        className="space-y-2"
        onSubmit={(e) => {
          e.preventDefault();
          submitTyped(typed);
        }}
      >
        <Field label="Or type the code from the label" htmlFor="typed-code" error={typedError} hint="Eight letters and digits, e.g. K7M4-4QZX (seven on older labels). Capitals, spaces and dashes do not matter.">
          <Input
            id="typed-code"
            value={typed}
            onChange={(e) => {
              setTyped(e.target.value);
              setTypedResult(null);
            }}
            autoComplete="off"
            autoCapitalize="characters"
            autoCorrect="off"
            spellCheck={false}
            enterKeyHint="go"
            className="font-mono text-title uppercase tracking-widest"
            aria-invalid={typedError ? true : undefined}
            aria-describedby={typedError ? "typed-code-error" : undefined}
          />
        </Field>
        {typedResult?.kind === "invalid" && typedResult.suggestions.length > 0 ? (
          <div className="flex flex-wrap gap-2">
            {typedResult.suggestions.map((s) => (
              <Button key={s} tone="quiet" className="font-mono tracking-widest" onClick={() => submitTyped(s)}>
                Open {s}
              </Button>
            ))}
          </div>
        ) : null}
        <Button type="submit" tone="primary" size="lg" className="w-full" disabled={!codes || typed.trim() === ""}>
          Open this bag
        </Button>
      </form>
    </div>
  );
}
