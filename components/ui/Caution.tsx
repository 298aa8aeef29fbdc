/** A calm caution box. Text defers to local rules and the seed supplier; it never alarms. */
export const cautionTexts = {
  foodFridge:
    "Keep seed bags sealed, labelled and boxed apart from food, out of reach of children. Some seeds are toxic and treated seed is poisonous. Follow local rules and your seed supplier's guidance.",
  toxic:
    "This species' seed can be toxic. Seal and label the bag, keep it boxed away from food and out of reach of children and pets, and wash your hands after handling. Your seed supplier's guidance comes first.",
  treated: "Treated seed is poisonous: never store it in a food fridge, wear gloves, and follow the supplier's label.",
  mould:
    "Mouldy material: discard it sealed in a bag, do not sniff or inhale it, and wash your hands afterwards. Rescue clean seed only if you can pick it out without spreading the mould.",
  medicinal: "Growing information only. Rimebook is not medical advice; ask a qualified practitioner before using any plant medicinally.",
} as const;

export function Caution({ title, children, tone = "calm" }: { title: string; children: React.ReactNode; tone?: "calm" | "strong" }) {
  const cls = tone === "strong" ? "border-ember-600 bg-ember-100" : "border-wheat-600 bg-wheat-100";
  return (
    <aside role="note" className={`rounded-card border-l-4 ${cls} p-3 text-label text-ink`}>
      <p className="font-semibold">{title}</p>
      <div className="mt-1">{children}</div>
    </aside>
  );
}
