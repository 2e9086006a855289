'use strict';

/** Tank and draws, on top of the fuel core (20261201001000):
 *  - dip_readings: every measured tank volume, matching or not, with the ledger row it caused;
 *  - a partial index for the lazy expiry of open reservations and a state CHECK on reservations;
 *  - draws: one draw per reservation, a reversal must reverse a draw of the same co-op, and the
 *    locked quantity/price/amount columns cannot be edited (a correction is a reversing entry);
 *  - tank_movements: append-only (UPDATE refused), and its draw FK checked at commit so the
 *    ledger row and its draw can be written in either order inside one transaction.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`CREATE INDEX reservations_open_window ON reservations (coop_id, window_end) WHERE status = 'open'`);
      await q(`CREATE INDEX reservations_coop_created ON reservations (coop_id, created_at DESC)`);
      await q(
        `ALTER TABLE reservations ADD CONSTRAINT reservations_closed_when_not_open CHECK ((status = 'open') = (closed_at IS NULL))`,
      );

      await q(`ALTER TABLE draws ADD CONSTRAINT draws_coop_id_id_key UNIQUE (coop_id, id)`);
      await q(
        `ALTER TABLE draws ADD CONSTRAINT draws_reversal_same_coop FOREIGN KEY (coop_id, reverses_draw_id) REFERENCES draws (coop_id, id)`,
      );
      await q(
        `ALTER TABLE draws ADD CONSTRAINT draws_reversal_has_reason CHECK (reverses_draw_id IS NULL OR length(btrim(reason)) > 0)`,
      );
      await q(
        `CREATE UNIQUE INDEX draws_one_per_reservation ON draws (reservation_id) WHERE reservation_id IS NOT NULL AND reverses_draw_id IS NULL`,
      );
      await q(`CREATE INDEX draws_coop_tank ON draws (coop_id, tank_id)`);
      await q(`
        CREATE FUNCTION draws_locked_columns() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF (NEW.coop_id, NEW.tank_id, NEW.membership_id, NEW.reservation_id, NEW.quantity_liters, NEW.meter_before, NEW.meter_after,
              NEW.declared_use, NEW.price_policy_id, NEW.unit_price_cents_per_gallon, NEW.surcharge_cents_per_gallon,
              NEW.road_tax_cents_per_gallon, NEW.fuel_cents, NEW.surcharge_cents, NEW.tax_cents, NEW.total_cents,
              NEW.cost_value_cents, NEW.reverses_draw_id, NEW.occurred_at)
             IS DISTINCT FROM
             (OLD.coop_id, OLD.tank_id, OLD.membership_id, OLD.reservation_id, OLD.quantity_liters, OLD.meter_before, OLD.meter_after,
              OLD.declared_use, OLD.price_policy_id, OLD.unit_price_cents_per_gallon, OLD.surcharge_cents_per_gallon,
              OLD.road_tax_cents_per_gallon, OLD.fuel_cents, OLD.surcharge_cents, OLD.tax_cents, OLD.total_cents,
              OLD.cost_value_cents, OLD.reverses_draw_id, OLD.occurred_at) THEN
            RAISE EXCEPTION 'a recorded draw cannot be edited; record a reversing entry instead' USING ERRCODE = 'check_violation';
          END IF;
          RETURN NEW;
        END $$`);
      await q(
        `CREATE TRIGGER draws_locked_columns BEFORE UPDATE ON draws FOR EACH ROW EXECUTE FUNCTION draws_locked_columns()`,
      );

      await q(`
        CREATE FUNCTION tank_movements_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          RAISE EXCEPTION 'the tank ledger is append-only' USING ERRCODE = 'check_violation';
        END $$`);
      await q(
        `CREATE TRIGGER tank_movements_append_only BEFORE UPDATE ON tank_movements FOR EACH ROW EXECUTE FUNCTION tank_movements_append_only()`,
      );
      await q(`ALTER TABLE tank_movements ALTER CONSTRAINT tank_movements_draw_id_fkey DEFERRABLE INITIALLY DEFERRED`);
      await q(`CREATE INDEX tank_movements_draw ON tank_movements (draw_id) WHERE draw_id IS NOT NULL`);

      await q(`
        CREATE TABLE dip_readings (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          tank_id INTEGER NOT NULL,
          measured_liters NUMERIC(14,3) NOT NULL CHECK (measured_liters >= 0),
          book_liters NUMERIC(14,3) NOT NULL CHECK (book_liters >= 0),
          movement_id BIGINT REFERENCES tank_movements(id),
          reason TEXT,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          measured_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id),
          CHECK ((measured_liters = book_liters) = (movement_id IS NULL))
        )`);
      await q(`CREATE INDEX dip_readings_coop_tank ON dip_readings (coop_id, tank_id, measured_at DESC)`);
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`DROP TABLE dip_readings`);
      await q(`DROP INDEX tank_movements_draw`);
      await q(`ALTER TABLE tank_movements ALTER CONSTRAINT tank_movements_draw_id_fkey NOT DEFERRABLE`);
      await q(`DROP TRIGGER tank_movements_append_only ON tank_movements`);
      await q(`DROP FUNCTION tank_movements_append_only()`);
      await q(`DROP TRIGGER draws_locked_columns ON draws`);
      await q(`DROP FUNCTION draws_locked_columns()`);
      await q(`DROP INDEX draws_coop_tank`);
      await q(`DROP INDEX draws_one_per_reservation`);
      await q(`ALTER TABLE draws DROP CONSTRAINT draws_reversal_has_reason`);
      await q(`ALTER TABLE draws DROP CONSTRAINT draws_reversal_same_coop`);
      await q(`ALTER TABLE draws DROP CONSTRAINT draws_coop_id_id_key`);
      await q(`ALTER TABLE reservations DROP CONSTRAINT reservations_closed_when_not_open`);
      await q(`DROP INDEX reservations_coop_created`);
      await q(`DROP INDEX reservations_open_window`);
    });
  },
};
