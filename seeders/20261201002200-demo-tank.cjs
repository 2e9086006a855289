'use strict';
// Demo tanks, prices, reservations and draws — an invented scenario. Idempotent: every step
// checks first, so running it again (or after the brewing seeder filled "North tank") adds
// nothing twice. Tank totals always equal the sum of their ledger rows.

const L_PER_GAL = 3.785411784; // US gallon, exact (NIST Handbook 44)
const DAY = 86_400_000;

/** Litres for US gallons as the NUMERIC(14,3) text we store (rounded to the millilitre). */
const galToLiters = (gal) => (Math.round(gal * L_PER_GAL * 1000) / 1000).toFixed(3);
const toMl = (liters) => Math.round(Number(liters) * 1000);
const mlText = (ml) => (ml / 1000).toFixed(3);
/** lib/money's rule: half away from zero, after trimming float noise to 15 digits. */
const roundHalfUp = (v) => {
  const m = Math.floor(Number(Math.abs(v).toPrecision(15)) + 0.5);
  return v < 0 ? -m : m;
};

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql, replacements) =>
        queryInterface.sequelize.query(sql, { transaction, replacements, type: 'SELECT' });
      const exec = (sql, replacements) => queryInterface.sequelize.query(sql, { transaction, replacements });
      const [prairie] = await q(`SELECT id FROM coops WHERE slug = 'prairie-lantern'`);
      const [harbour] = await q(`SELECT id FROM coops WHERE slug = 'harbourside'`);
      if (!prairie || !harbour) return;
      const [treasurer] = await q(`SELECT id FROM users WHERE lower(email) = 'tobias.treasurer@example.org'`);
      const [brewer] = await q(`SELECT id FROM users WHERE lower(email) = 'juniper.brewer@example.org'`);
      const [ines] = await q(`SELECT id FROM users WHERE lower(email) = 'ines.admin@example.org'`);
      const [dale] = await q(
        `SELECT m.id FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.coop_id = :c AND lower(u.email) = 'dale.member@example.org'`,
        { c: prairie.id },
      );

      // Pricing: an older policy and the one in force (cost + 40 ¢/gal, 10 ¢ reserve, 24.4 ¢ road tax).
      const [hasPrairiePolicy] = await q(`SELECT 1 AS x FROM price_policies WHERE coop_id = :c LIMIT 1`, {
        c: prairie.id,
      });
      if (!hasPrairiePolicy) {
        await exec(
          `INSERT INTO price_policies (coop_id, kind, margin_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon, effective_from, created_by_user_id, created_at)
           VALUES (:c, 'cost-plus-amount', 35, 0, 24.4, now() - interval '120 days', :u, now() - interval '120 days'),
                  (:c, 'cost-plus-amount', 40, 10, 24.4, now() - interval '60 days', :u, now() - interval '60 days')`,
          { c: prairie.id, u: treasurer ? treasurer.id : null },
        );
      }
      // Harbourside works in litres: a fixed $1.45 a litre, stored per US gallon (145 × 3.785411784 = 548.885 ¢/gal).
      const [hasHarbourPolicy] = await q(`SELECT 1 AS x FROM price_policies WHERE coop_id = :c LIMIT 1`, {
        c: harbour.id,
      });
      if (!hasHarbourPolicy) {
        await exec(
          `INSERT INTO price_policies (coop_id, kind, price_cents_per_gallon, effective_from, created_by_user_id, created_at)
           VALUES (:c, 'fixed', :p, now() - interval '30 days', :u, now() - interval '30 days')`,
          { c: harbour.id, p: (Math.round(145 * L_PER_GAL * 1000) / 1000).toFixed(3), u: ines ? ines.id : null },
        );
      }

      // Tanks, by name (the brewing seeder may create "North tank" too and release batches into it).
      const ensureTank = (coopId, name, capacityLiters) =>
        exec(
          `INSERT INTO tanks (coop_id, name, capacity_liters) VALUES (:c, :n, :cap) ON CONFLICT (coop_id, name) DO NOTHING`,
          { c: coopId, n: name, cap: capacityLiters },
        );
      await ensureTank(prairie.id, 'North tank', galToLiters(1000));
      await ensureTank(prairie.id, 'Barn tote', galToLiters(275));
      await ensureTank(harbour.id, 'Harbour tank', '1500.000');

      /** Appends ledger rows to a tank, keeping its running totals equal to the sum of its rows. */
      async function move(tankName, coopId, rows) {
        const [t] = await q(
          `SELECT id, on_hand_liters, value_cents FROM tanks WHERE coop_id = :c AND name = :n FOR UPDATE`,
          { c: coopId, n: tankName },
        );
        let onHand = toMl(t.on_hand_liters);
        let value = Number(t.value_cents);
        const out = [];
        // Lineage (as lib/tank/lineage does for a well-mixed tank): a valued inflow is unattributed
        // fuel; an outflow takes every layer in proportion, leftover millilitres to the largest
        // remainders (ties to the oldest layer).
        const layers = (
          await q(`SELECT batch_id, quantity_liters FROM tank_layers WHERE tank_id = :t ORDER BY id`, { t: t.id })
        ).map((l) => ({ batchId: l.batch_id, ml: toMl(l.quantity_liters) }));
        const sharesFor = (ml) => {
          if (ml > 0) {
            layers.push({ batchId: null, ml });
            return [{ batchId: null, ml }];
          }
          const total = layers.reduce((a, l) => a + l.ml, 0);
          const parts = layers.map((l) => ({ q: Math.floor((l.ml * -ml) / total), r: (l.ml * -ml) % total }));
          let left = -ml - parts.reduce((a, p) => a + p.q, 0);
          parts
            .map((p, i) => ({ i, r: p.r }))
            .sort((a, b) => b.r - a.r || a.i - b.i)
            .forEach(({ i }) => {
              if (left > 0) {
                parts[i].q += 1;
                left -= 1;
              }
            });
          layers.forEach((l, i) => {
            l.ml -= parts[i].q;
          });
          return layers.map((l, i) => ({ batchId: l.batchId, ml: -parts[i].q })).filter((x) => x.ml !== 0);
        };
        for (const r of rows) {
          const avgPerGal = onHand > 0 ? (value / onHand) * 1000 * L_PER_GAL : null;
          const before = { onHand, value, avgPerGal };
          const draw = r.draw ? await r.draw(before) : null;
          let moved;
          if (r.valueCents !== undefined) moved = r.valueCents;
          else if (r.ml < 0) moved = onHand + r.ml === 0 ? -value : -Math.round((value * -r.ml) / onHand);
          else moved = onHand > 0 ? Math.round((value * r.ml) / onHand) : 0;
          onHand += r.ml;
          value = Math.max(0, value + moved);
          const [m] = await q(
            `INSERT INTO tank_movements (coop_id, tank_id, kind, quantity_liters, value_cents, on_hand_after_liters, value_after_cents, draw_id, reason, created_by_user_id, occurred_at)
             VALUES (:c, :t, :kind, :qty, :moved, :after, :valueAfter, :drawId, :reason, :u, :at) RETURNING id`,
            {
              c: coopId,
              t: t.id,
              kind: r.kind,
              qty: mlText(r.ml),
              moved,
              after: mlText(onHand),
              valueAfter: value,
              drawId: draw ? draw.id : null,
              reason: r.reason || null,
              u: r.userId || null,
              at: r.at,
            },
          );
          for (const sh of sharesFor(r.ml)) {
            await exec(
              `INSERT INTO movement_batch_shares (coop_id, movement_id, tank_id, draw_id, batch_id, quantity_liters) VALUES (:c, :m, :t, :d, :b, :q)`,
              {
                c: coopId,
                m: m.id,
                t: t.id,
                d: draw ? draw.id : null,
                b: sh.batchId,
                q: mlText(sh.ml),
              },
            );
          }
          if (draw) await draw.finish(-moved);
          out.push({ movementId: m.id, bookBefore: before.onHand });
        }
        await exec(`UPDATE tanks SET on_hand_liters = :oh, value_cents = :v, updated_at = now() WHERE id = :t`, {
          oh: mlText(onHand),
          v: value,
          t: t.id,
        });
        await exec(`DELETE FROM tank_layers WHERE tank_id = :t`, { t: t.id });
        for (const l of layers.filter((x) => x.ml > 0)) {
          await exec(`INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) VALUES (:c, :t, :b, :q)`, {
            c: coopId,
            t: t.id,
            b: l.batchId,
            q: mlText(l.ml),
          });
        }
        return { tankId: t.id, out };
      }

      // An opening balance where a tank has no fuel yet, recorded as a dip reading (value at the stated cost).
      async function openingBalance(coopId, tankName, ml, valueCents, userId) {
        const [t] = await q(`SELECT id, on_hand_liters FROM tanks WHERE coop_id = :c AND name = :n`, {
          c: coopId,
          n: tankName,
        });
        const [any] = await q(`SELECT 1 AS x FROM tank_movements WHERE tank_id = :t LIMIT 1`, { t: t.id });
        if (any || toMl(t.on_hand_liters) > 0) return;
        const at = new Date(Date.now() - 45 * DAY);
        const { out } = await move(tankName, coopId, [
          { kind: 'dip-adjustment', ml, valueCents, reason: 'Opening balance', userId, at },
        ]);
        await exec(
          `INSERT INTO dip_readings (coop_id, tank_id, measured_liters, book_liters, movement_id, reason, created_by_user_id, measured_at)
           VALUES (:c, :t, :m, '0', :mv, 'Opening balance', :u, :at)`,
          { c: coopId, t: t.id, m: mlText(ml), mv: out[0].movementId, u: userId, at },
        );
      }
      await openingBalance(prairie.id, 'North tank', toMl(galToLiters(300)), 300 * 310, brewer ? brewer.id : null); // 300 gal at $3.10/gal
      await openingBalance(harbour.id, 'Harbour tank', 600_000, 600 * 82, ines ? ines.id : null); // 600 L at $0.82/L

      // Dale's reservations and draws at North tank — only once, and only when it has fuel.
      if (!dale) return;
      const [done] = await q(
        `SELECT 1 AS x FROM reservations WHERE membership_id = :m UNION ALL SELECT 1 FROM draws WHERE membership_id = :m LIMIT 1`,
        { m: dale.id },
      );
      const [north] = await q(
        `SELECT id, on_hand_liters, reserved_liters FROM tanks WHERE coop_id = :c AND name = 'North tank'`,
        { c: prairie.id },
      );
      if (done || toMl(north.on_hand_liters) - toMl(north.reserved_liters) < toMl(galToLiters(40))) return;
      const [policy] = await q(
        `SELECT id, margin_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon FROM price_policies
         WHERE coop_id = :c AND effective_from <= now() - interval '11 days' ORDER BY effective_from DESC, id DESC LIMIT 1`,
        { c: prairie.id },
      );
      const margin = Number(policy.margin_cents_per_gallon);
      const surcharge = Number(policy.surcharge_cents_per_gallon);
      const roadTax = Number(policy.road_tax_cents_per_gallon);

      const drawRow = (o) => ({
        async draw(before) {
          // Price in force: average cost rounded to the cent + margin (lib/pricing cost-plus-amount); lines rounded per lib/money.
          const base = roundHalfUp(before.avgPerGal) + margin;
          const tax = o.use === 'road' ? roadTax : 0;
          const fuel = roundHalfUp(base * o.gal);
          const sur = roundHalfUp(surcharge * o.gal);
          const taxCents = roundHalfUp(tax * o.gal);
          const [d] = await q(`SELECT nextval(pg_get_serial_sequence('draws', 'id')) AS id`);
          return {
            id: d.id,
            finish: (costValueCents) =>
              exec(
                `INSERT INTO draws (id, coop_id, tank_id, membership_id, reservation_id, quantity_liters, meter_before, meter_after, declared_use, vehicle, price_policy_id,
                   unit_price_cents_per_gallon, surcharge_cents_per_gallon, road_tax_cents_per_gallon, fuel_cents, surcharge_cents, tax_cents, total_cents,
                   cost_value_cents, recorded_by_user_id, occurred_at)
                 VALUES (:id, :c, :t, :m, :r, :q, :mb, :ma, :use, :vehicle, :p, :base, :sur, :tax, :fuel, :surCents, :taxCents, :total, :cost, :u, :at)`,
                {
                  id: d.id,
                  c: prairie.id,
                  t: north.id,
                  m: dale.id,
                  r: o.reservationId || null,
                  q: galToLiters(o.gal),
                  mb: galToLiters(o.meter),
                  ma: galToLiters(o.meter + o.gal),
                  use: o.use,
                  vehicle: o.vehicle,
                  p: policy.id,
                  base,
                  sur: surcharge,
                  tax,
                  fuel,
                  surCents: sur,
                  taxCents,
                  total: fuel + sur + taxCents,
                  cost: costValueCents,
                  u: brewer ? brewer.id : null,
                  at: o.at,
                },
              ),
          };
        },
      });

      // A reservation Dale drew three days ago, one he cancelled, and one open for the coming week.
      const now = Date.now();
      const [drawnRes] = await q(
        `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end, status, closed_at, created_at)
         VALUES (:c, :t, :m, :q, :ws, :we, 'drawn', :closed, :ws) RETURNING id`,
        {
          c: prairie.id,
          t: north.id,
          m: dale.id,
          q: galToLiters(10),
          ws: new Date(now - 5 * DAY),
          we: new Date(now - 2 * DAY),
          closed: new Date(now - 3 * DAY),
        },
      );
      await exec(
        `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end, status, closed_at, created_at)
         VALUES (:c, :t, :m, :q, :ws, :we, 'cancelled', :closed, :ws)`,
        {
          c: prairie.id,
          t: north.id,
          m: dale.id,
          q: galToLiters(20),
          ws: new Date(now - 20 * DAY),
          we: new Date(now - 15 * DAY),
          closed: new Date(now - 19 * DAY),
        },
      );
      await move('North tank', prairie.id, [
        {
          kind: 'draw',
          ml: -toMl(galToLiters(12.5)),
          userId: brewer && brewer.id,
          at: new Date(now - 10 * DAY),
          ...drawRow({
            gal: 12.5,
            meter: 1204.2,
            use: 'road',
            vehicle: '2004 pickup (diesel)',
            at: new Date(now - 10 * DAY),
          }),
        },
        {
          kind: 'draw',
          ml: -toMl(galToLiters(8)),
          userId: brewer && brewer.id,
          at: new Date(now - 3 * DAY),
          ...drawRow({
            gal: 8,
            meter: 1216.7,
            use: 'heating',
            vehicle: 'Home furnace',
            reservationId: drawnRes.id,
            at: new Date(now - 3 * DAY),
          }),
        },
      ]);
      const openQ = galToLiters(15);
      await exec(
        `INSERT INTO reservations (coop_id, tank_id, membership_id, quantity_liters, window_start, window_end) VALUES (:c, :t, :m, :q, :ws, :we)`,
        { c: prairie.id, t: north.id, m: dale.id, q: openQ, ws: new Date(now - DAY), we: new Date(now + 7 * DAY) },
      );
      await exec(
        `UPDATE tanks SET reserved_liters = reserved_liters + :q WHERE id = :t AND on_hand_liters - reserved_liters >= :q`,
        { q: openQ, t: north.id },
      );
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const exec = (sql) => queryInterface.sequelize.query(sql, { transaction });
      const coops = `(SELECT id FROM coops WHERE slug IN ('prairie-lantern', 'harbourside'))`;
      const dale = `(SELECT m.id FROM memberships m JOIN users u ON u.id = m.user_id WHERE lower(u.email) = 'dale.member@example.org')`;
      await exec(`DELETE FROM dip_readings WHERE coop_id IN ${coops} AND reason = 'Opening balance'`);
      await exec(
        `DELETE FROM movement_batch_shares WHERE movement_id IN (SELECT id FROM tank_movements WHERE coop_id IN ${coops} AND (reason = 'Opening balance' OR draw_id IN (SELECT id FROM draws WHERE membership_id IN ${dale})))`,
      );
      await exec(
        `DELETE FROM tank_movements WHERE coop_id IN ${coops} AND (reason = 'Opening balance' OR draw_id IN (SELECT id FROM draws WHERE membership_id IN ${dale}))`,
      );
      await exec(`DELETE FROM draws WHERE membership_id IN ${dale}`);
      await exec(`DELETE FROM reservations WHERE membership_id IN ${dale}`);
      await exec(`DELETE FROM price_policies WHERE coop_id IN ${coops}`);
      // Totals back to the sum of what remains (e.g. the brewing seeder's releases).
      await exec(`UPDATE tanks t SET on_hand_liters = coalesce((SELECT sum(quantity_liters) FROM tank_movements m WHERE m.tank_id = t.id), 0),
                    value_cents = coalesce((SELECT sum(value_cents) FROM tank_movements m WHERE m.tank_id = t.id), 0),
                    reserved_liters = coalesce((SELECT sum(quantity_liters) FROM reservations r WHERE r.tank_id = t.id AND r.status = 'open'), 0)
                  WHERE t.coop_id IN ${coops}`);
      // The remaining fuel's lineage is no longer known: one unattributed layer per tank.
      await exec(`DELETE FROM tank_layers WHERE coop_id IN ${coops}`);
      await exec(
        `INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters) SELECT coop_id, id, NULL, on_hand_liters FROM tanks WHERE coop_id IN ${coops} AND on_hand_liters > 0`,
      );
      await exec(`DELETE FROM tanks t WHERE t.coop_id IN ${coops} AND t.name IN ('North tank', 'Barn tote', 'Harbour tank')
                    AND NOT EXISTS (SELECT 1 FROM tank_movements m WHERE m.tank_id = t.id) AND NOT EXISTS (SELECT 1 FROM reservations r WHERE r.tank_id = t.id)`);
    });
  },
};
