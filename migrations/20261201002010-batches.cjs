'use strict';

/** The batch record: one row per batch with its plan (oil, titration, recipe and the computed
 *  catalyst and methanol), what was actually done at each step, quality results and, once
 *  released, its cost breakdown. Child tables: oil lots used, temperature readings, chemical
 *  consumption (FIFO slices of chemical lots, written on release), uploaded files.
 *  Also links tank_movements.batch_id to batches. Volumes are litres NUMERIC(14,3), temperatures
 *  °C, money integer cents. Child rows reference (coop_id, id) pairs so they cannot cross co-ops.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`
        CREATE TABLE batches (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          number INTEGER NOT NULL CHECK (number > 0),
          status VARCHAR(10) NOT NULL DEFAULT 'planned'
            CHECK (status IN ('planned','reacting','settling','draining','washing','drying','testing','released','rejected')),
          batch_date DATE NOT NULL DEFAULT current_date,
          status_changed_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          oil_liters NUMERIC(14,3) NOT NULL CHECK (oil_liters > 0),
          titration_trials_ml JSONB NOT NULL CHECK (jsonb_typeof(titration_trials_ml) = 'array' AND jsonb_array_length(titration_trials_ml) >= 1),
          titration_blank_ml NUMERIC(6,2) NOT NULL DEFAULT 0 CHECK (titration_blank_ml >= 0),
          titration_source VARCHAR(10) NOT NULL DEFAULT 'trials' CHECK (titration_source IN ('trials','oil-lot')),
          titrant VARCHAR(4) NOT NULL CHECK (titrant IN ('KOH','NaOH')),
          titration_avg_ml NUMERIC(8,4) NOT NULL CHECK (titration_avg_ml >= 0),
          catalyst VARCHAR(4) NOT NULL CHECK (catalyst IN ('KOH','NaOH')),
          base_g_per_l NUMERIC(8,3) NOT NULL CHECK (base_g_per_l >= 0),
          purity_pct NUMERIC(5,2) NOT NULL CHECK (purity_pct > 0 AND purity_pct <= 100),
          titrant_from VARCHAR(14) NOT NULL CHECK (titrant_from IN ('same-catalyst','pure-reagent')),
          catalyst_rule VARCHAR(40) NOT NULL,
          methanol_mode VARCHAR(12) NOT NULL CHECK (methanol_mode IN ('percent','molar-ratio')),
          methanol_pct NUMERIC(6,2) CHECK (methanol_pct > 0 AND methanol_pct <= 100),
          molar_ratio NUMERIC(6,2) CHECK (molar_ratio > 0 AND molar_ratio <= 30),
          computed_catalyst_grams NUMERIC(12,3) NOT NULL CHECK (computed_catalyst_grams >= 0),
          computed_methanol_liters NUMERIC(14,3) NOT NULL CHECK (computed_methanol_liters >= 0),
          actual_catalyst_grams NUMERIC(12,3) CHECK (actual_catalyst_grams >= 0),
          actual_methanol_liters NUMERIC(14,3) CHECK (actual_methanol_liters >= 0),
          mixing_minutes INTEGER CHECK (mixing_minutes >= 0),
          settling_hours NUMERIC(6,2) CHECK (settling_hours >= 0),
          glycerin_liters NUMERIC(14,3) CHECK (glycerin_liters >= 0),
          wash_cycles INTEGER CHECK (wash_cycles >= 0),
          wash_water_liters NUMERIC(14,3) CHECK (wash_water_liters >= 0),
          drying_method VARCHAR(10) CHECK (drying_method IN ('air','bubble','heat','vacuum','settle','other')),
          drying_notes TEXT,
          quick_tests JSONB NOT NULL DEFAULT '{}'::jsonb,
          lab_results JSONB NOT NULL DEFAULT '{}'::jsonb,
          quality_standard VARCHAR(12) NOT NULL DEFAULT 'ASTM D6751' CHECK (quality_standard IN ('ASTM D6751','EN 14214')),
          quality_verdict VARCHAR(10) NOT NULL DEFAULT 'incomplete' CHECK (quality_verdict IN ('pass','fail','incomplete')),
          screening_verdict VARCHAR(16) NOT NULL DEFAULT 'incomplete' CHECK (screening_verdict IN ('looks-good','needs-attention','incomplete')),
          energy_kwh NUMERIC(10,3) CHECK (energy_kwh >= 0),
          heater_kw NUMERIC(8,3) CHECK (heater_kw >= 0),
          heater_hours NUMERIC(8,2) CHECK (heater_hours >= 0),
          tariff_cents_per_kwh NUMERIC(10,4) CHECK (tariff_cents_per_kwh >= 0),
          feedstock_cents_override BIGINT CHECK (feedstock_cents_override >= 0),
          other_cents BIGINT NOT NULL DEFAULT 0 CHECK (other_cents >= 0),
          other_notes TEXT,
          tank_id INTEGER,
          released_liters NUMERIC(14,3) CHECK (released_liters > 0),
          released_at TIMESTAMPTZ,
          rejected_at TIMESTAMPTZ,
          reject_reason TEXT,
          cost_methanol_cents BIGINT CHECK (cost_methanol_cents >= 0),
          cost_catalyst_cents BIGINT CHECK (cost_catalyst_cents >= 0),
          cost_energy_cents BIGINT CHECK (cost_energy_cents >= 0),
          cost_feedstock_cents BIGINT CHECK (cost_feedstock_cents >= 0),
          cost_other_cents BIGINT CHECK (cost_other_cents >= 0),
          total_cost_cents BIGINT CHECK (total_cost_cents >= 0),
          cost_per_gallon_cents BIGINT CHECK (cost_per_gallon_cents >= 0),
          notes TEXT,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, number),
          UNIQUE (coop_id, id),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id),
          CONSTRAINT batches_methanol_mode CHECK (
            (methanol_mode = 'percent' AND methanol_pct IS NOT NULL) OR (methanol_mode = 'molar-ratio' AND molar_ratio IS NOT NULL)),
          CONSTRAINT batches_energy_one_form CHECK (energy_kwh IS NULL OR (heater_kw IS NULL AND heater_hours IS NULL)),
          CONSTRAINT batches_released_complete CHECK ((status = 'released') = (released_at IS NOT NULL AND tank_id IS NOT NULL
            AND released_liters IS NOT NULL AND total_cost_cents IS NOT NULL AND cost_per_gallon_cents IS NOT NULL)),
          CONSTRAINT batches_rejected_complete CHECK ((status = 'rejected') = (rejected_at IS NOT NULL AND reject_reason IS NOT NULL)),
          CONSTRAINT batches_total_is_sum CHECK (total_cost_cents IS NULL OR total_cost_cents =
            cost_methanol_cents + cost_catalyst_cents + cost_energy_cents + cost_feedstock_cents + cost_other_cents)
        )`);
      await q(`CREATE INDEX batches_coop_id ON batches (coop_id)`);
      await q(`CREATE INDEX batches_coop_status_number ON batches (coop_id, status, number DESC)`);
      await q(`CREATE INDEX batches_coop_date ON batches (coop_id, batch_date DESC, number DESC)`);
      // The batch list sorts by cost per gallon and volume released with unreleased batches last, either way.
      await q(
        `CREATE INDEX batches_coop_cost_asc ON batches (coop_id, cost_per_gallon_cents ASC NULLS LAST, number ASC)`,
      );
      await q(
        `CREATE INDEX batches_coop_cost_desc ON batches (coop_id, cost_per_gallon_cents DESC NULLS LAST, number DESC)`,
      );
      await q(`CREATE INDEX batches_coop_volume_asc ON batches (coop_id, released_liters ASC NULLS LAST, number ASC)`);
      await q(
        `CREATE INDEX batches_coop_volume_desc ON batches (coop_id, released_liters DESC NULLS LAST, number DESC)`,
      );
      await q(`
        CREATE TABLE batch_oil_lots (
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          batch_id INTEGER NOT NULL,
          oil_lot_id INTEGER NOT NULL,
          liters NUMERIC(14,3) NOT NULL CHECK (liters > 0),
          PRIMARY KEY (batch_id, oil_lot_id),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id) ON DELETE CASCADE,
          FOREIGN KEY (coop_id, oil_lot_id) REFERENCES oil_lots (coop_id, id)
        )`);
      await q(`CREATE INDEX batch_oil_lots_coop_id ON batch_oil_lots (coop_id)`);
      await q(`CREATE INDEX batch_oil_lots_oil_lot ON batch_oil_lots (oil_lot_id)`);
      await q(`
        CREATE TABLE batch_temperatures (
          id BIGSERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          batch_id INTEGER NOT NULL,
          measured_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          temp_c NUMERIC(6,2) NOT NULL CHECK (temp_c > -50 AND temp_c < 200),
          level VARCHAR(8) NOT NULL CHECK (level IN ('cold','ok','warning','danger')),
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id) ON DELETE CASCADE
        )`);
      await q(`CREATE INDEX batch_temperatures_coop_id ON batch_temperatures (coop_id)`);
      await q(`CREATE INDEX batch_temperatures_batch ON batch_temperatures (batch_id, measured_at)`);
      await q(`
        CREATE TABLE chemical_consumptions (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          batch_id INTEGER NOT NULL,
          chemical_lot_id INTEGER NOT NULL,
          quantity NUMERIC(14,3) NOT NULL CHECK (quantity > 0),
          cost_cents BIGINT NOT NULL CHECK (cost_cents >= 0),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (batch_id, chemical_lot_id),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id),
          FOREIGN KEY (coop_id, chemical_lot_id) REFERENCES chemical_lots (coop_id, id)
        )`);
      await q(`CREATE INDEX chemical_consumptions_coop_id ON chemical_consumptions (coop_id)`);
      await q(`CREATE INDEX chemical_consumptions_lot ON chemical_consumptions (chemical_lot_id)`);
      await q(`
        CREATE TABLE batch_files (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          batch_id INTEGER NOT NULL,
          purpose VARCHAR(12) NOT NULL CHECK (purpose IN ('photo','lab-report')),
          file_kind VARCHAR(4) NOT NULL CHECK (file_kind IN ('pdf','jpeg','png')),
          storage_key VARCHAR(80) NOT NULL UNIQUE,
          original_name VARCHAR(200) NOT NULL,
          size_bytes INTEGER NOT NULL CHECK (size_bytes > 0),
          uploaded_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id) ON DELETE CASCADE
        )`);
      await q(`CREATE INDEX batch_files_coop_id ON batch_files (coop_id)`);
      await q(`CREATE INDEX batch_files_batch ON batch_files (batch_id)`);
      await q(
        `ALTER TABLE tank_movements ADD CONSTRAINT tank_movements_batch_fk FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id)`,
      );
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`ALTER TABLE tank_movements DROP CONSTRAINT tank_movements_batch_fk`);
      for (const t of ['batch_files', 'chemical_consumptions', 'batch_temperatures', 'batch_oil_lots', 'batches']) {
        await q(`DROP TABLE ${t}`);
      }
    });
  },
};
