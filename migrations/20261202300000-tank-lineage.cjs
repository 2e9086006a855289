'use strict';

/** Batch lineage in the tank ledger, and batch reviews (recalls):
 *  - tanks.mixing: 'mixed' (well mixed: a draw takes every batch in proportion) or 'fifo'
 *    (first in, first out: the oldest fuel leaves first); tanks.held_liters: fuel that may not
 *    be reserved, drawn or moved while a batch in it is under review (kept by lib/tank/lineage);
 *  - tank_layers: a tank's fuel by batch (NULL batch = unattributed, e.g. an opening balance),
 *    oldest first by id; a DEFERRABLE INITIALLY DEFERRED constraint trigger checks at commit that
 *    every touched tank's layers sum exactly to its on-hand quantity;
 *  - movement_batch_shares: which batches each ledger row moved, signed like the row; a draw's
 *    shares must sum exactly to its ledger row (constraint trigger, at commit);
 *  - batch_reviews: a released batch under review after a failing late lab result or a flag,
 *    closed with an outcome (cleared, re-treated in a new batch, disposed of with a receipt);
 *  - tank_movements.kind gains 'disposal' and 'retreat' (held fuel leaving the tank);
 *    batch_files.purpose gains 'receipt' (a disposal receipt).
 *  Backfill: a tank's existing fuel, whose origin the ledger did not record, becomes one
 *  unattributed layer.
 *  @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(
        `ALTER TABLE tanks ADD COLUMN mixing VARCHAR(5) NOT NULL DEFAULT 'mixed' CHECK (mixing IN ('mixed','fifo'))`,
      );
      await q(`ALTER TABLE tanks ADD COLUMN held_liters NUMERIC(14,3) NOT NULL DEFAULT 0`);
      await q(
        `ALTER TABLE tanks ADD CONSTRAINT tanks_held_within_on_hand CHECK (held_liters >= 0 AND held_liters <= on_hand_liters)`,
      );

      await q(`ALTER TABLE tank_movements DROP CONSTRAINT tank_movements_kind_check`);
      await q(`ALTER TABLE tank_movements ADD CONSTRAINT tank_movements_kind_check
               CHECK (kind IN ('release','draw','draw-reversal','dip-adjustment','transfer-in','transfer-out','opening','disposal','retreat'))`);
      await q(`ALTER TABLE batch_files DROP CONSTRAINT batch_files_purpose_check`);
      await q(
        `ALTER TABLE batch_files ADD CONSTRAINT batch_files_purpose_check CHECK (purpose IN ('photo','lab-report','receipt'))`,
      );
      await q(`ALTER TABLE batch_files ADD CONSTRAINT batch_files_coop_id_id_key UNIQUE (coop_id, id)`);

      await q(`
        CREATE TABLE tank_layers (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          tank_id INTEGER NOT NULL,
          batch_id INTEGER,
          quantity_liters NUMERIC(14,3) NOT NULL CHECK (quantity_liters > 0),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id)
        )`);
      await q(`CREATE INDEX tank_layers_coop_tank ON tank_layers (coop_id, tank_id, id)`);
      await q(`CREATE INDEX tank_layers_coop_batch ON tank_layers (coop_id, batch_id) WHERE batch_id IS NOT NULL`);

      await q(`
        CREATE TABLE movement_batch_shares (
          id BIGSERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          movement_id BIGINT NOT NULL REFERENCES tank_movements(id),
          tank_id INTEGER NOT NULL,
          draw_id INTEGER,
          batch_id INTEGER,
          quantity_liters NUMERIC(14,3) NOT NULL CHECK (quantity_liters <> 0),
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, tank_id) REFERENCES tanks (coop_id, id),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id),
          FOREIGN KEY (coop_id, draw_id) REFERENCES draws (coop_id, id) DEFERRABLE INITIALLY DEFERRED
        )`);
      await q(`CREATE INDEX movement_batch_shares_movement ON movement_batch_shares (movement_id)`);
      await q(`CREATE INDEX movement_batch_shares_coop_batch ON movement_batch_shares (coop_id, batch_id)`);
      await q(`CREATE INDEX movement_batch_shares_draw ON movement_batch_shares (draw_id) WHERE draw_id IS NOT NULL`);
      await q(
        `CREATE TRIGGER movement_batch_shares_append_only BEFORE UPDATE ON movement_batch_shares FOR EACH ROW EXECUTE FUNCTION tank_movements_append_only()`,
      );

      // Layers sum to on hand: checked at commit for every tank a statement touched.
      await q(`
        CREATE FUNCTION tank_layers_sum_check() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE
          t_id INTEGER;
          on_hand NUMERIC;
          layered NUMERIC;
        BEGIN
          -- One branch per table: a record's fields are resolved when the expression runs.
          IF TG_TABLE_NAME = 'tanks' THEN t_id := NEW.id;
          ELSIF TG_OP = 'DELETE' THEN t_id := OLD.tank_id;
          ELSE t_id := NEW.tank_id;
          END IF;
          SELECT on_hand_liters INTO on_hand FROM tanks WHERE id = t_id;
          IF on_hand IS NULL THEN RETURN NULL; END IF;
          SELECT coalesce(sum(quantity_liters), 0) INTO layered FROM tank_layers WHERE tank_id = t_id;
          IF layered <> on_hand THEN
            RAISE EXCEPTION 'tank %: layers hold % L but the tank has % L on hand', t_id, layered, on_hand
              USING ERRCODE = 'check_violation', CONSTRAINT = 'tank_layers_sum_to_on_hand';
          END IF;
          RETURN NULL;
        END $$`);
      await q(`CREATE CONSTRAINT TRIGGER tank_layers_sum_to_on_hand AFTER INSERT OR UPDATE OR DELETE ON tank_layers
               DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION tank_layers_sum_check()`);
      await q(`CREATE CONSTRAINT TRIGGER tanks_on_hand_layered AFTER INSERT OR UPDATE OF on_hand_liters ON tanks
               DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION tank_layers_sum_check()`);

      // A draw's batch shares sum to the draw's ledger row.
      await q(`
        CREATE FUNCTION movement_shares_sum_check() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE shared NUMERIC;
        BEGIN
          SELECT coalesce(sum(quantity_liters), 0) INTO shared FROM movement_batch_shares WHERE movement_id = NEW.id;
          IF shared <> NEW.quantity_liters THEN
            RAISE EXCEPTION 'ledger row %: batch shares sum to % L, not % L', NEW.id, shared, NEW.quantity_liters
              USING ERRCODE = 'check_violation', CONSTRAINT = 'draw_shares_sum_to_quantity';
          END IF;
          RETURN NULL;
        END $$`);
      await q(`CREATE CONSTRAINT TRIGGER draw_shares_sum_to_quantity AFTER INSERT ON tank_movements
               DEFERRABLE INITIALLY DEFERRED FOR EACH ROW WHEN (NEW.draw_id IS NOT NULL) EXECUTE FUNCTION movement_shares_sum_check()`);

      await q(`
        CREATE TABLE batch_reviews (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          batch_id INTEGER NOT NULL,
          status VARCHAR(6) NOT NULL DEFAULT 'open' CHECK (status IN ('open','closed')),
          cause VARCHAR(10) NOT NULL CHECK (cause IN ('lab-result','flag')),
          finding TEXT NOT NULL CHECK (length(btrim(finding)) > 0),
          held_liters NUMERIC(14,3) NOT NULL DEFAULT 0,
          opened_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          opened_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          outcome VARCHAR(10) CHECK (outcome IN ('cleared','retreated','disposed')),
          outcome_notes TEXT,
          disposal_method TEXT,
          receipt_file_id INTEGER,
          retreat_batch_id INTEGER,
          closed_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          closed_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, id),
          FOREIGN KEY (coop_id, batch_id) REFERENCES batches (coop_id, id),
          FOREIGN KEY (coop_id, receipt_file_id) REFERENCES batch_files (coop_id, id),
          FOREIGN KEY (coop_id, retreat_batch_id) REFERENCES batches (coop_id, id),
          CONSTRAINT batch_reviews_outcome_when_closed CHECK ((status = 'closed') = (outcome IS NOT NULL AND closed_at IS NOT NULL)),
          CONSTRAINT batch_reviews_disposal_complete CHECK (outcome IS DISTINCT FROM 'disposed' OR (length(btrim(disposal_method)) > 0 AND receipt_file_id IS NOT NULL)),
          CONSTRAINT batch_reviews_retreat_batch CHECK (outcome IS DISTINCT FROM 'retreated' OR retreat_batch_id IS NOT NULL)
        )`);
      await q(`CREATE UNIQUE INDEX batch_reviews_one_open ON batch_reviews (batch_id) WHERE status = 'open'`);
      await q(`CREATE INDEX batch_reviews_coop_batch ON batch_reviews (coop_id, batch_id, opened_at DESC)`);

      // Backfill: existing fuel of unrecorded origin is one unattributed layer per tank.
      await q(`INSERT INTO tank_layers (coop_id, tank_id, batch_id, quantity_liters)
               SELECT coop_id, id, NULL, on_hand_liters FROM tanks WHERE on_hand_liters > 0 ORDER BY id`);
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      await q(`DROP TABLE batch_reviews`);
      await q(`DROP TRIGGER draw_shares_sum_to_quantity ON tank_movements`);
      await q(`DROP FUNCTION movement_shares_sum_check()`);
      await q(`DROP TRIGGER tanks_on_hand_layered ON tanks`);
      await q(`DROP TRIGGER tank_layers_sum_to_on_hand ON tank_layers`);
      await q(`DROP FUNCTION tank_layers_sum_check()`);
      await q(`DROP TABLE movement_batch_shares`);
      await q(`DROP TABLE tank_layers`);
      await q(`ALTER TABLE batch_files DROP CONSTRAINT batch_files_coop_id_id_key`);
      await q(`ALTER TABLE batch_files DROP CONSTRAINT batch_files_purpose_check`);
      await q(
        `ALTER TABLE batch_files ADD CONSTRAINT batch_files_purpose_check CHECK (purpose IN ('photo','lab-report'))`,
      );
      await q(`ALTER TABLE tank_movements DROP CONSTRAINT tank_movements_kind_check`);
      await q(`ALTER TABLE tank_movements ADD CONSTRAINT tank_movements_kind_check
               CHECK (kind IN ('release','draw','draw-reversal','dip-adjustment','transfer-in','transfer-out','opening'))`);
      await q(`ALTER TABLE tanks DROP CONSTRAINT tanks_held_within_on_hand`);
      await q(`ALTER TABLE tanks DROP COLUMN held_liters`);
      await q(`ALTER TABLE tanks DROP COLUMN mixing`);
    });
  },
};
