'use strict';

/** The shared fuel core: tanks with running totals, the append-only tank ledger, pricing
 *  policies, reservations and draws. Quantities are litres as NUMERIC(14,3) (never floats);
 *  money and stock value are integer cents; per-gallon rates are cents with up to three
 *  decimals (a road tax such as 24.4 ¢/gal), and every charged amount is whole cents. Invariants live in CHECK constraints.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE tanks (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          name VARCHAR(80) NOT NULL,
          capacity_liters NUMERIC(14,3) NOT NULL CHECK (capacity_liters > 0),
          on_hand_liters NUMERIC(14,3) NOT NULL DEFAULT 0 CHECK (on_hand_liters >= 0),
          reserved_liters NUMERIC(14,3) NOT NULL DEFAULT 0 CHECK (reserved_liters >= 0),
          value_cents BIGINT NOT NULL DEFAULT 0 CHECK (value_cents >= 0),
          active BOOLEAN NOT NULL DEFAULT true,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CONSTRAINT tanks_reserved_within_on_hand CHECK (reserved_liters <= on_hand_liters),
          UNIQUE (coop_id, name),
          UNIQUE (coop_id, id)
        )`);
      await q(`CREATE INDEX tanks_coop_id ON tanks (coop_id)`);
      await q(`
        CREATE TABLE price_policies (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          kind VARCHAR(20) NOT NULL CHECK (kind IN ('fixed','cost-plus-amount','cost-plus-percent')),
          price_cents_per_gallon NUMERIC(12,3) CHECK (price_cents_per_gallon >= 0),
          margin_cents_per_gallon NUMERIC(12,3) CHECK (margin_cents_per_gallon >= 0),
          margin_pct NUMERIC(6,2) CHECK (margin_pct >= 0),
          surcharge_cents_per_gallon NUMERIC(12,3) NOT NULL DEFAULT 0 CHECK (surcharge_cents_per_gallon >= 0),
          road_tax_cents_per_gallon NUMERIC(12,3) NOT NULL DEFAULT 0 CHECK (road_tax_cents_per_gallon >= 0),
          effective_from TIMESTAMPTZ NOT NULL DEFAULT now(),
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CHECK ((kind = 'fixed' AND price_cents_per_gallon IS NOT NULL)
              OR (kind = 'cost-plus-amount' AND margin_cents_per_gallon IS NOT NULL)
              OR (kind = 'cost-plus-percent' AND margin_pct IS NOT NULL))
        )`);
      await q(`CREATE INDEX price_policies_coop_effective ON price_policies (coop_id, effective_from DESC)`);
      await q(`
        CREATE TABLE reservations (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          tank_id INTEGER NOT NULL,
          membership_id INTEGER NOT NULL REFERENCES memberships(id) ON DELETE CASCADE,
          quantity_liters NUMERIC(14,3) NOT NULL CHECK (quantity_liters > 0),
          window_start TIMESTAMPTZ NOT NULL,
          window_end TIMESTAMPTZ NOT NULL,
          status VARCHAR(20) NOT NULL DEFAULT 'open' CHECK (status IN ('open','drawn','cancelled','expired')),
          closed_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CHECK (window_end > window_start),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id)
        )`);
      await q(`CREATE INDEX reservations_coop_status ON reservations (coop_id, status, window_end)`);
      await q(`CREATE INDEX reservations_membership ON reservations (membership_id)`);
      await q(`
        CREATE TABLE draws (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          tank_id INTEGER NOT NULL,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          reservation_id INTEGER REFERENCES reservations(id),
          quantity_liters NUMERIC(14,3) NOT NULL CHECK (quantity_liters <> 0),
          meter_before NUMERIC(14,3),
          meter_after NUMERIC(14,3),
          declared_use VARCHAR(20) NOT NULL CHECK (declared_use IN ('road','off-road','heating')),
          vehicle VARCHAR(120),
          price_policy_id INTEGER REFERENCES price_policies(id),
          unit_price_cents_per_gallon NUMERIC(12,3) NOT NULL,
          surcharge_cents_per_gallon NUMERIC(12,3) NOT NULL DEFAULT 0,
          road_tax_cents_per_gallon NUMERIC(12,3) NOT NULL DEFAULT 0,
          fuel_cents BIGINT NOT NULL,
          surcharge_cents BIGINT NOT NULL DEFAULT 0,
          tax_cents BIGINT NOT NULL DEFAULT 0,
          total_cents BIGINT NOT NULL,
          cost_value_cents BIGINT NOT NULL DEFAULT 0,
          reverses_draw_id INTEGER UNIQUE REFERENCES draws(id),
          reason TEXT,
          recorded_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          occurred_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CHECK (total_cents = fuel_cents + surcharge_cents + tax_cents),
          CHECK (meter_before IS NULL OR meter_after IS NULL OR meter_after >= meter_before),
          CHECK ((reverses_draw_id IS NULL AND quantity_liters > 0) OR (reverses_draw_id IS NOT NULL AND quantity_liters < 0)),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id)
        )`);
      await q(`CREATE INDEX draws_coop_occurred ON draws (coop_id, occurred_at DESC)`);
      await q(`CREATE INDEX draws_membership ON draws (membership_id, occurred_at DESC)`);
      await q(`
        CREATE TABLE tank_movements (
          id BIGSERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          tank_id INTEGER NOT NULL,
          kind VARCHAR(20) NOT NULL CHECK (kind IN ('release','draw','draw-reversal','dip-adjustment','transfer-in','transfer-out')),
          quantity_liters NUMERIC(14,3) NOT NULL CHECK (quantity_liters <> 0),
          value_cents BIGINT NOT NULL,
          on_hand_after_liters NUMERIC(14,3) NOT NULL,
          value_after_cents BIGINT NOT NULL,
          batch_id INTEGER,
          draw_id INTEGER REFERENCES draws(id),
          transfer_tank_id INTEGER,
          reason TEXT,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          occurred_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id)
        )`);
      await q(`CREATE INDEX tank_movements_tank ON tank_movements (coop_id, tank_id, id DESC)`);
      await q(`CREATE INDEX tank_movements_batch ON tank_movements (batch_id) WHERE batch_id IS NOT NULL`);
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      for (const t of ['tank_movements', 'draws', 'reservations', 'price_policies', 'tanks']) {
        await queryInterface.sequelize.query(`DROP TABLE ${t}`, { transaction });
      }
    });
  },
};
