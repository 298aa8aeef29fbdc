/** Where a protocol's numbers come from: a published source (starter row) or the farm's own. Glyph + words, not colour alone. */
export function OriginBadge({ farmOwn }: { farmOwn: boolean }) {
  return farmOwn ? (
    <span className="inline-flex shrink-0 items-center gap-1 rounded-full bg-moss-100 px-2.5 py-0.5 text-label font-semibold text-moss-700">
      <span aria-hidden="true">✎</span> Farm&apos;s own
    </span>
  ) : (
    <span className="inline-flex shrink-0 items-center gap-1 rounded-full bg-rime-200 px-2.5 py-0.5 text-label font-semibold text-glacier-800">
      <span aria-hidden="true">❝</span> Published source
    </span>
  );
}
