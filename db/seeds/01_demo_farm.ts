import type { Knex } from "knex";
import { randomBytes, randomUUID } from "node:crypto";
import { hashPassword } from "@/lib/server/passwords";
import { installStarterProtocols } from "@/lib/server/protocols";
import { generateBagCode } from "@/lib/domain/bag-codes";
import { addDaysToIsoDay, countDaysBetween, formatIsoDay } from "@/lib/domain/dates";
import { computePullWindow, type ProtocolForPlan } from "@/lib/domain/schedule";
import type { Moisture, Mould, Sprouts } from "@/lib/schemas/vocabulary";
import { demoBags, demoFarm, demoHistoryBags, demoHistoryLots, demoLots, demoMembers, demoPlan, demoStores } from "./data/demo-farm";

// Loads "Bramblewick Native Nursery" afresh: removes the previous demo farm and its members, then
// writes a season of invented records with dates relative to today.

/** Small deterministic generator so the demo looks the same on every load. */
function makeRandom(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

export async function seed(knex: Knex): Promise<void> {
  const today = formatIsoDay(new Date());
  const random = makeRandom(20261202);
  const now = new Date().toISOString();

  await knex.transaction(async (trx) => {
    const emails = demoMembers.map((m) => m.email);
    const oldUsers = await trx("users").whereIn("email", emails).pluck("id");
    await trx("farms").where({ id: demoFarm.id }).delete(); // cascades to every farm-owned row
    if (oldUsers.length) await trx("users").whereIn("id", oldUsers).delete();

    await trx("farms").insert({
      id: demoFarm.id,
      name: demoFarm.name,
      last_frost_date: demoFarm.lastFrostDate,
      location_note: demoFarm.locationNote,
      temperature_unit: "C",
      weekly_check_days: 7,
      seq: 0,
      created_at: now,
      updated_at: now,
    });

    let seq = 0;
    const stamp = () => ({ farm_id: demoFarm.id, created_at: now, updated_at: now, seq: ++seq, deleted_at: null });

    // Members, one per role.
    const userIds: Record<string, string> = {};
    for (const m of demoMembers) {
      const id = randomUUID();
      userIds[m.key] = id;
      await trx("users").insert({ id, email: m.email, name: m.name, password_hash: await hashPassword(m.password), created_at: now, updated_at: now });
      await trx("memberships").insert({ id: randomUUID(), user_id: id, role: m.role, digest_opt_in: m.role !== "visitor", ...stamp() });
    }

    // The starter protocol library, as every new farm gets it.
    await trx("farms").where({ id: demoFarm.id }).update({ seq });
    await installStarterProtocols(trx, demoFarm.id);
    seq = Number((await trx("farms").where({ id: demoFarm.id }).first("seq")).seq);
    const protocols = await trx("protocols").where({ farm_id: demoFarm.id }).select("id", "species", "phases", "effective_band");
    const protocolFor = (species: string) =>
      protocols.find((p) => p.species === species) ?? protocols.find((p) => String(p.species).startsWith(species.split(" ")[0]));

    // Cold stores and a season of readings every six hours, with one door-ajar excursion in the barn fridge.
    const storeIds: Record<string, string> = {};
    for (const s of demoStores) {
      const id = randomUUID();
      storeIds[s.key] = id;
      await trx("stores").insert({ id, name: s.name, kind: s.kind, boxes: JSON.stringify(s.boxes), holds_food: s.holdsFood, notes: null, ...stamp() });
      const readings = [];
      const startMs = Date.now() - 90 * 86_400_000;
      for (let t = startMs; t <= Date.now(); t += 6 * 3_600_000) {
        const hoursAgo = (Date.now() - t) / 3_600_000;
        let c = s.meanC + (random() - 0.5) * 2 * s.spreadC;
        if (s.key === "barn" && hoursAgo > 9 * 24 && hoursAgo < 9 * 24 + 13) c = 11.5 + random(); // door left ajar
        readings.push({ id: randomUUID(), store_id: id, taken_at: new Date(t).toISOString(), temperature_c: Math.round(c * 10) / 10, origin: "import", check_id: null, ...stamp() });
      }
      for (let i = 0; i < readings.length; i += 200) await trx("readings").insert(readings.slice(i, i + 200));
    }

    // Lots.
    const lotIds: Record<string, string> = {};
    for (const l of demoLots) {
      const id = randomUUID();
      lotIds[l.key] = id;
      await trx("lots").insert({
        id, species: l.species === "Sambucus" ? "Sambucus canadensis" : l.species, common_name: l.common, source: l.source,
        year: l.year, quantity: l.quantity, protocol_id: protocolFor(l.species)?.id ?? null, treated: false, notes: null, ...stamp(),
      });
    }

    // A trial: the same coneflower lot in the fridge and in the freezer.
    const trialId = randomUUID();
    await trx("trials").insert({ id: trialId, name: "Coneflower: fridge or freezer?", lot_id: lotIds.coneflower, question: "Does a month in the freezer do as well as a month in the fridge for our own coneflower seed?", notes: null, ...stamp() });
    const armIds = { fridge: randomUUID(), freezer: randomUUID() };
    await trx("trial_arms").insert([
      { id: armIds.fridge, trial_id: trialId, label: "Fridge 4 weeks", treatment: "Barn fridge, about 3–4 °C, damp towel", position: 0, ...stamp() },
      { id: armIds.freezer, trial_id: trialId, label: "Freezer 4 weeks", treatment: "Chest freezer, about −18 °C, damp towel", position: 1, ...stamp() },
    ]);

    // Bags in every state, with their checks, sowings and counts.
    const usedCodes = new Set<string>();
    const pickUnusedCode = () => {
      let code: string;
      do code = generateBagCode(randomBytes(8)); while (usedCodes.has(code));
      usedCodes.add(code);
      return code;
    };
    const checkers = [userIds.helper, userIds.grower, userIds.owner];
    for (const [i, b] of demoBags.entries()) {
      const lot = demoLots.find((l) => l.key === b.lot)!;
      const p = protocolFor(lot.species);
      const protocol: ProtocolForPlan | null = p
        ? { species: p.species, phases: JSON.parse(p.phases), effectiveBand: p.effective_band ? JSON.parse(p.effective_band) : null }
        : null;
      const probe = protocol ? computePullWindow(protocol, today) : null;
      const opensAfter = probe ? countDaysBetween(today, probe.opensOn) : 30;
      const closesAfter = probe?.closesOn ? countDaysBetween(today, probe.closesOn) : opensAfter + 14;

      let start: string | null;
      switch (b.state) {
        case "planned": start = null; break;
        case "chilling": start = addDaysToIsoDay(today, -Math.min(b.daysIn ?? 7, Math.max(opensAfter - 2, 1))); break;
        case "window_open": start = addDaysToIsoDay(today, -(opensAfter + Math.min(2, Math.max(0, closesAfter - opensAfter - 1)))); break;
        case "overdue": start = addDaysToIsoDay(today, -(closesAfter + 3)); break;
        default: start = addDaysToIsoDay(today, -(opensAfter + 20 + (i % 5)));
      }
      const window = protocol && start ? computePullWindow(protocol, start) : null;
      const pulledOn = ["pulled", "sown"].includes(b.state) && window ? addDaysToIsoDay(window.opensOn, 1) : null;
      const sownOn = b.state === "sown" && pulledOn ? addDaysToIsoDay(pulledOn, 1) : null;
      const discardedOn = b.state === "discarded" && start ? addDaysToIsoDay(start, 18) : null;

      const code = pickUnusedCode();
      const bagId = randomUUID();
      await trx("bags").insert({
        id: bagId, code, lot_id: lotIds[b.lot], protocol_id: p?.id ?? null, store_id: storeIds[b.store], box: b.box,
        medium: b.medium, seed_count: b.seeds, start_date: start,
        planned_start_date: start ? null : addDaysToIsoDay(today, 5 + i),
        window_start: window?.opensOn ?? null, window_end: window?.closesOn ?? null,
        pulled_on: pulledOn, sown_on: sownOn, discarded_on: discardedOn,
        discard_reason: discardedOn ? "Mould spreading through the towel; bag sealed and binned." : null,
        trial_arm_id: b.trialArm ? armIds[b.trialArm] : null, plan_item_id: null, check_every_days: null, note: null, ...stamp(),
      });

      // Weekly checks from the start to the pull (or today), daily once the window opened.
      if (start) {
        const until = discardedOn ?? pulledOn ?? today;
        const checks = [];
        let day = addDaysToIsoDay(start, 7);
        while (day <= until) {
          const last = addDaysToIsoDay(day, 7) > until;
          let moisture: Moisture = random() < 0.12 ? "dry" : "damp";
          let mould: Mould = "clean";
          let sprouts: Sprouts = "none";
          const actions: string[] = moisture === "dry" ? ["added_water"] : [];
          if (last && b.mouldSpots) { moisture = "soggy"; mould = "spots"; actions.splice(0, actions.length, "blotted"); }
          if (last && b.firstRoots) sprouts = "first_roots";
          if (last && b.state === "discarded") { mould = "spreading"; actions.splice(0, actions.length, "discarded"); }
          if (pulledOn && day === until) { sprouts = "first_roots"; actions.push("pulled"); }
          checks.push({
            id: randomUUID(), bag_id: bagId, checked_at: `${day}T${String(8 + (checks.length % 3)).padStart(2, "0")}:15:00.000Z`,
            checked_by: checkers[checks.length % checkers.length], moisture, mould, sprouts, actions: JSON.stringify(actions),
            note: null, temperature_c: null, ...stamp(),
          });
          day = window && day >= window.opensOn ? addDaysToIsoDay(day, 1) : addDaysToIsoDay(day, 7);
          if (window && day > window.opensOn && checks.length && addDaysToIsoDay(day, -1) < window.opensOn) day = window.opensOn;
        }
        if (checks.length) await trx("checks").insert(checks);
      }

      // Sowing and daily cumulative counts for sown bags.
      if (sownOn && b.germinated !== undefined) {
        const sowingId = randomUUID();
        await trx("sowings").insert({ id: sowingId, bag_id: bagId, sown_on: sownOn, tray: `Tray ${i + 1}`, cells: 72, seeds_sown: b.seeds, note: null, ...stamp() });
        let total = 0;
        const counts = [];
        for (let d = 4; d <= 16; d++) {
          const counted = addDaysToIsoDay(sownOn, d);
          if (counted > today) break;
          // A bell of emergence around day 8–9 that reaches the bag's final count.
          const share = Math.exp(-((d - 8.5) ** 2) / 6);
          total = Math.min(b.germinated, total + Math.max(0, Math.round(b.germinated * share * 0.36)));
          if (d === 16) total = b.germinated;
          counts.push({ id: randomUUID(), sowing_id: sowingId, counted_on: counted, germinated_total: total, note: null, ...stamp() });
        }
        if (counts.length) await trx("counts").insert(counts);
      }
    }

    // Two earlier seasons of finished bags (invented), so the farm's own history shows on first run. Weekly checks,
    // plus the check that first saw roots (or the bag's last day); the medium dries faster in the barn fridge.
    for (const l of demoHistoryLots) {
      const id = randomUUID();
      lotIds[l.key] = id;
      await trx("lots").insert({
        id, species: l.species, common_name: l.common, source: l.source, year: l.year, quantity: l.quantity,
        protocol_id: protocolFor(l.species)?.id ?? null, treated: false, notes: "Earlier season (demo history).", ...stamp(),
      });
    }
    const dryAfter = { barn: 12, shed: 17 } as const;
    for (const [i, h] of demoHistoryBags.entries()) {
      const lot = [...demoLots, ...demoHistoryLots].find((l) => l.key === h.lot)!;
      const p = protocolFor(lot.species);
      const protocol: ProtocolForPlan | null = p ? { species: p.species, phases: JSON.parse(p.phases), effectiveBand: p.effective_band ? JSON.parse(p.effective_band) : null } : null;
      const start = addDaysToIsoDay(today, -(365 * h.seasonsAgo + 20 + ((i * 7) % 40)));
      const window = protocol ? computePullWindow(protocol, start) : null;
      const lastDay = h.rootsDay ?? h.endDay!;
      const endOn = addDaysToIsoDay(start, lastDay);
      const discarded = h.rootsDay === null && h.end === "discarded";
      const pulledOn = discarded ? null : endOn;
      const code = pickUnusedCode();
      const bagId = randomUUID();
      await trx("bags").insert({
        id: bagId, code, lot_id: lotIds[h.lot], protocol_id: p?.id ?? null, store_id: storeIds[h.store], box: h.box,
        medium: "paper_towel", seed_count: 50, start_date: start, planned_start_date: null,
        window_start: window?.opensOn ?? null, window_end: window?.closesOn ?? null,
        pulled_on: pulledOn, sown_on: pulledOn ? addDaysToIsoDay(pulledOn, 1) : null, discarded_on: discarded ? endOn : null,
        discard_reason: discarded ? "Mould spreading; bag sealed and binned." : null,
        trial_arm_id: null, plan_item_id: null, check_every_days: null, note: "Earlier season (demo history).", ...stamp(),
      });
      const checks = [];
      let wetSince = 0;
      const days = [];
      for (let d = 7; d < lastDay; d += 7) days.push(d);
      days.push(lastDay);
      for (const d of days) {
        const last = d === lastDay;
        const dry = d - wetSince >= dryAfter[h.store] + Math.floor(random() * 3);
        if (dry) wetSince = d;
        const actions: string[] = dry ? ["added_water"] : [];
        if (last && h.rootsDay !== null) actions.push("pulled");
        if (last && discarded) actions.splice(0, actions.length, "discarded");
        checks.push({
          id: randomUUID(), bag_id: bagId, checked_at: `${addDaysToIsoDay(start, d)}T${String(8 + (d % 3)).padStart(2, "0")}:30:00.000Z`,
          checked_by: checkers[d % checkers.length], moisture: dry ? "dry" : "damp", mould: last && discarded ? "spreading" : "clean",
          sprouts: last && h.rootsDay !== null ? "first_roots" : "none", actions: JSON.stringify(actions), note: null, temperature_c: null, ...stamp(),
        });
      }
      await trx("checks").insert(checks);
    }

    // Next season's plan.
    const season = Number(today.slice(0, 4)) + (Number(today.slice(5, 7)) >= 7 ? 1 : 0);
    for (const item of demoPlan) {
      const lot = demoLots.find((l) => l.key === item.lot)!;
      await trx("plan_items").insert({
        id: randomUUID(), season, species: lot.species === "Sambucus" ? "Sambucus canadensis" : lot.species, lot_id: lotIds[item.lot],
        protocol_id: protocolFor(lot.species)?.id ?? null, target_plants: item.targetPlants,
        sowing_rule: JSON.stringify({ anchor: "frost", weeks: item.weeks, place: item.place }),
        expected_germination: item.expectedGermination, expected_survival: 0.8, bag_id: null, note: null, ...stamp(),
      });
    }

    await trx("farms").where({ id: demoFarm.id }).update({ seq });
  });
}

