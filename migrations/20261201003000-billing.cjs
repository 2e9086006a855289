'use strict';

/** Billing: monthly invoices with their lines, per-co-op gapless invoice numbers, member credit,
 *  card payment attempts, payments (card, cash, cheque), refunds, adjustments for the next
 *  invoice, the payments provider's webhook events, invoicing runs with progress, and month close.
 *
 *  Invariants kept by the database:
 *  - invoice numbers: UNIQUE (coop_id, number), assigned from a per-co-op counter row locked
 *    FOR UPDATE at issue time (drafts have no number), so there are no duplicates and no gaps;
 *  - one live invoice per member and month (partial UNIQUE, void ones excluded);
 *  - each draw and each adjustment is billed at most once (partial UNIQUE on the line, lines of
 *    a voided invoice are "released" so the draw can be billed again);
 *  - at most one open card attempt per invoice; idempotency keys, charge ids and webhook event
 *    ids are UNIQUE;
 *  - a payment's amount = applied + credited + unallocated + refunded;
 *  - issued invoices and their lines are not edited or deleted (void by credit note only);
 *  - a closed month's draws, invoices and payments refuse changes (statement triggers raise
 *    SQLSTATE TV409, which the app answers with 409); member credit is an append-only ledger.
 *  @type {import('sequelize-cli').Migration} */

const CLOSED_MSG = `'Billing month ' || to_char(hit, 'YYYY-MM') || ' is closed: its draws, invoices and payments can no longer change. Record the correction as an adjustment in an open month.'`;

module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });

      await q(`
        CREATE TABLE billing_periods (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          period DATE NOT NULL CHECK (EXTRACT(DAY FROM period) = 1),
          status VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open','closed')),
          closed_at TIMESTAMPTZ,
          closed_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          summary JSONB,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, period),
          CHECK ((status = 'closed') = (closed_at IS NOT NULL))
        )`);
      await q(`CREATE INDEX billing_periods_coop_id ON billing_periods (coop_id)`);

      await q(`
        CREATE TABLE invoice_counters (
          coop_id INTEGER PRIMARY KEY REFERENCES coops(id) ON DELETE CASCADE,
          last_number INTEGER NOT NULL DEFAULT 0 CHECK (last_number >= 0),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);

      await q(`
        CREATE TABLE billing_runs (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          period DATE NOT NULL CHECK (EXTRACT(DAY FROM period) = 1),
          status VARCHAR(12) NOT NULL DEFAULT 'running' CHECK (status IN ('running','completed','failed','abandoned')),
          member_ids INTEGER[],
          total_members INTEGER NOT NULL DEFAULT 0 CHECK (total_members >= 0),
          done_members INTEGER NOT NULL DEFAULT 0 CHECK (done_members >= 0),
          drafts INTEGER NOT NULL DEFAULT 0 CHECK (drafts >= 0),
          error TEXT,
          started_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          heartbeat_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          finished_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CHECK (done_members <= total_members)
        )`);
      await q(`CREATE INDEX billing_runs_coop_period ON billing_runs (coop_id, period, id DESC)`);
      await q(
        `CREATE UNIQUE INDEX billing_runs_one_running ON billing_runs (coop_id, period) WHERE status = 'running'`,
      );

      await q(`
        CREATE TABLE billing_adjustments (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          amount_cents BIGINT NOT NULL CHECK (amount_cents <> 0),
          description VARCHAR(200) NOT NULL CHECK (length(description) > 0),
          period DATE NOT NULL CHECK (EXTRACT(DAY FROM period) = 1),
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, id)
        )`);
      await q(`CREATE INDEX billing_adjustments_coop_member ON billing_adjustments (coop_id, membership_id)`);

      await q(`
        CREATE TABLE invoices (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          period DATE NOT NULL CHECK (EXTRACT(DAY FROM period) = 1),
          kind VARCHAR(12) NOT NULL DEFAULT 'invoice' CHECK (kind IN ('invoice','credit-note')),
          number INTEGER CHECK (number > 0),
          status VARCHAR(12) NOT NULL DEFAULT 'draft' CHECK (status IN ('draft','issued','partly-paid','paid','void')),
          credit_note_for_id INTEGER UNIQUE REFERENCES invoices(id),
          total_cents BIGINT NOT NULL DEFAULT 0,
          paid_cents BIGINT NOT NULL DEFAULT 0 CHECK (paid_cents >= 0),
          billing_run_id INTEGER REFERENCES billing_runs(id) ON DELETE SET NULL,
          issued_at TIMESTAMPTZ,
          due_on DATE,
          voided_at TIMESTAMPTZ,
          void_reason VARCHAR(240),
          email_status VARCHAR(10) NOT NULL DEFAULT 'not-sent' CHECK (email_status IN ('not-sent','queued','sending','sent','failed')),
          email_attempts INTEGER NOT NULL DEFAULT 0,
          emailed_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          UNIQUE (coop_id, number),
          UNIQUE (coop_id, id),
          CHECK ((status = 'draft') = (number IS NULL)),
          CHECK ((status = 'draft') = (issued_at IS NULL)),
          CHECK ((kind = 'credit-note') = (credit_note_for_id IS NOT NULL)),
          CHECK (kind = 'invoice' OR status IN ('draft','issued')),
          CHECK ((status = 'void') = (voided_at IS NOT NULL)),
          CHECK (paid_cents <= GREATEST(total_cents, 0))
        )`);
      await q(
        `CREATE UNIQUE INDEX invoices_one_live_per_member_month ON invoices (coop_id, membership_id, period) WHERE kind = 'invoice' AND status <> 'void'`,
      );
      await q(`CREATE INDEX invoices_coop_period ON invoices (coop_id, period, status)`);
      await q(`CREATE INDEX invoices_membership ON invoices (membership_id, period DESC)`);
      await q(`CREATE INDEX invoices_email_queue ON invoices (coop_id) WHERE email_status = 'queued'`);

      await q(`
        CREATE TABLE invoice_lines (
          id BIGSERIAL PRIMARY KEY,
          -- The line's co-op must be its invoice's co-op: checked by the statement trigger below with
          -- primary-key lookups. (A composite foreign key to invoices (coop_id, id) lets the planner
          -- cache a plan on the (coop_id, period, status) index for its per-row check, which turns a
          -- 10,000-member run quadratic.)
          coop_id INTEGER NOT NULL,
          invoice_id INTEGER NOT NULL REFERENCES invoices(id) ON DELETE CASCADE,
          sort_key INTEGER NOT NULL,
          kind VARCHAR(16) NOT NULL CHECK (kind IN ('draw','draw-reversal','dues','surcharge','road-tax','adjustment','credit')),
          description VARCHAR(240) NOT NULL,
          occurred_at TIMESTAMPTZ,
          quantity_liters NUMERIC(14,3),
          unit_price_cents_per_gallon NUMERIC(12,3),
          amount_cents BIGINT NOT NULL,
          draw_id INTEGER REFERENCES draws(id),
          adjustment_id INTEGER REFERENCES billing_adjustments(id),
          released BOOLEAN NOT NULL DEFAULT false,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          CHECK (draw_id IS NULL OR kind IN ('draw','draw-reversal')),
          CHECK (adjustment_id IS NULL OR kind = 'adjustment'),
          CHECK (kind <> 'credit' OR amount_cents <= 0)
        )`);
      await q(`CREATE INDEX invoice_lines_invoice ON invoice_lines (invoice_id, sort_key)`);
      await q(`CREATE INDEX invoice_lines_coop_id ON invoice_lines (coop_id)`);
      await q(
        `CREATE UNIQUE INDEX invoice_lines_draw_billed_once ON invoice_lines (draw_id) WHERE draw_id IS NOT NULL AND NOT released`,
      );
      await q(
        `CREATE UNIQUE INDEX invoice_lines_adjustment_billed_once ON invoice_lines (adjustment_id) WHERE adjustment_id IS NOT NULL AND NOT released`,
      );

      await q(`
        CREATE TABLE payment_attempts (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          invoice_id INTEGER NOT NULL,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          amount_cents BIGINT NOT NULL CHECK (amount_cents > 0),
          currency CHAR(3) NOT NULL,
          card_token VARCHAR(60) NOT NULL,
          idempotency_key VARCHAR(80) NOT NULL UNIQUE,
          status VARCHAR(10) NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','succeeded','failed')),
          stripe_charge_id VARCHAR(80) UNIQUE,
          failure_code VARCHAR(60),
          failure_message VARCHAR(240),
          lease_until TIMESTAMPTZ,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          completed_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, invoice_id) REFERENCES invoices (coop_id, id),
          CHECK ((status = 'pending') = (completed_at IS NULL)),
          CHECK (status <> 'succeeded' OR stripe_charge_id IS NOT NULL)
        )`);
      await q(`CREATE INDEX payment_attempts_coop_id ON payment_attempts (coop_id, status)`);
      await q(`CREATE INDEX payment_attempts_invoice ON payment_attempts (coop_id, invoice_id)`);
      await q(
        `CREATE UNIQUE INDEX payment_attempts_one_open_per_invoice ON payment_attempts (invoice_id) WHERE status = 'pending'`,
      );

      await q(`
        CREATE TABLE payments (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          invoice_id INTEGER,
          method VARCHAR(10) NOT NULL CHECK (method IN ('card','cash','cheque')),
          amount_cents BIGINT NOT NULL CHECK (amount_cents > 0),
          applied_cents BIGINT NOT NULL DEFAULT 0 CHECK (applied_cents >= 0),
          credited_cents BIGINT NOT NULL DEFAULT 0 CHECK (credited_cents >= 0),
          unallocated_cents BIGINT NOT NULL DEFAULT 0 CHECK (unallocated_cents >= 0),
          refunded_cents BIGINT NOT NULL DEFAULT 0 CHECK (refunded_cents >= 0),
          received_on DATE NOT NULL,
          period DATE NOT NULL,
          reference VARCHAR(60),
          note VARCHAR(240),
          stripe_charge_id VARCHAR(80) UNIQUE,
          payment_attempt_id INTEGER UNIQUE REFERENCES payment_attempts(id),
          recorded_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, invoice_id) REFERENCES invoices (coop_id, id),
          UNIQUE (coop_id, id),
          CHECK (amount_cents = applied_cents + credited_cents + unallocated_cents + refunded_cents),
          CHECK (invoice_id IS NOT NULL OR applied_cents = 0),
          CHECK (period = date_trunc('month', received_on)::date),
          CHECK ((method = 'card') = (stripe_charge_id IS NOT NULL))
        )`);
      await q(`CREATE INDEX payments_coop_period ON payments (coop_id, period)`);
      await q(`CREATE INDEX payments_invoice ON payments (invoice_id) WHERE invoice_id IS NOT NULL`);
      await q(`CREATE INDEX payments_membership ON payments (membership_id)`);

      await q(`
        CREATE TABLE refunds (
          id SERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          payment_id INTEGER NOT NULL,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          amount_cents BIGINT NOT NULL CHECK (amount_cents > 0),
          from_unallocated_cents BIGINT NOT NULL DEFAULT 0 CHECK (from_unallocated_cents >= 0),
          from_credit_cents BIGINT NOT NULL DEFAULT 0 CHECK (from_credit_cents >= 0),
          status VARCHAR(10) NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','succeeded','failed')),
          idempotency_key VARCHAR(80) UNIQUE,
          stripe_refund_id VARCHAR(80) UNIQUE,
          reason VARCHAR(240) NOT NULL,
          failure_message VARCHAR(240),
          refunded_on DATE NOT NULL,
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          completed_at TIMESTAMPTZ,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          updated_at TIMESTAMPTZ NOT NULL DEFAULT now(),
          FOREIGN KEY (coop_id, payment_id) REFERENCES payments (coop_id, id),
          CHECK (amount_cents = from_unallocated_cents + from_credit_cents),
          CHECK ((status = 'pending') = (completed_at IS NULL))
        )`);
      await q(`CREATE INDEX refunds_coop_id ON refunds (coop_id, status)`);
      await q(`CREATE INDEX refunds_payment ON refunds (payment_id)`);

      await q(`
        CREATE TABLE member_credits (
          id BIGSERIAL PRIMARY KEY,
          coop_id INTEGER NOT NULL REFERENCES coops(id) ON DELETE CASCADE,
          membership_id INTEGER NOT NULL REFERENCES memberships(id),
          amount_cents BIGINT NOT NULL CHECK (amount_cents <> 0),
          kind VARCHAR(20) NOT NULL CHECK (kind IN ('overpayment','applied','refund','refund-reversed','void-restore','void-reverse','negative-invoice')),
          payment_id INTEGER REFERENCES payments(id),
          invoice_id INTEGER REFERENCES invoices(id),
          refund_id INTEGER REFERENCES refunds(id),
          created_by_user_id INTEGER REFERENCES users(id) ON DELETE SET NULL,
          created_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX member_credits_coop_member ON member_credits (coop_id, membership_id)`);
      await q(`CREATE INDEX member_credits_invoice ON member_credits (invoice_id) WHERE invoice_id IS NOT NULL`);

      // Events from the payments provider. Not owned by one co-op until we recognise it: coop_id
      // is filled from the event's metadata when it names one of ours (NULL for foreign events).
      await q(`
        CREATE TABLE payment_webhook_events (
          id BIGSERIAL PRIMARY KEY,
          stripe_event_id VARCHAR(80) NOT NULL UNIQUE,
          type VARCHAR(80) NOT NULL,
          coop_id INTEGER REFERENCES coops(id) ON DELETE CASCADE,
          object_id VARCHAR(80),
          outcome VARCHAR(40) NOT NULL,
          payload JSONB NOT NULL,
          received_at TIMESTAMPTZ NOT NULL DEFAULT now()
        )`);
      await q(`CREATE INDEX payment_webhook_events_coop_id ON payment_webhook_events (coop_id)`);

      // ── Month close: statement-level triggers (one check per statement, fast for bulk runs). ──
      await q(`
        CREATE FUNCTION billing_lock_draws() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE hit DATE;
        BEGIN
          IF TG_OP IN ('INSERT', 'UPDATE') THEN
            SELECT bp.period INTO hit FROM new_rows n JOIN coops c ON c.id = n.coop_id
              JOIN billing_periods bp ON bp.coop_id = n.coop_id AND bp.status = 'closed'
               AND bp.period = date_trunc('month', n.occurred_at AT TIME ZONE c.timezone)::date
              LIMIT 1;
            IF hit IS NOT NULL THEN RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG}; END IF;
          END IF;
          IF TG_OP IN ('UPDATE', 'DELETE') THEN
            SELECT bp.period INTO hit FROM old_rows o JOIN coops c ON c.id = o.coop_id
              JOIN billing_periods bp ON bp.coop_id = o.coop_id AND bp.status = 'closed'
               AND bp.period = date_trunc('month', o.occurred_at AT TIME ZONE c.timezone)::date
              LIMIT 1;
            IF hit IS NOT NULL THEN RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG}; END IF;
          END IF;
          RETURN NULL;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_draws_ins AFTER INSERT ON draws REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_draws()`,
      );
      await q(
        `CREATE TRIGGER billing_lock_draws_upd AFTER UPDATE ON draws REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_draws()`,
      );
      await q(
        `CREATE TRIGGER billing_lock_draws_del AFTER DELETE ON draws REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_draws()`,
      );

      // Invoices: issued ones keep their content; a closed month's invoices change only in what
      // later payments and e-mails touch (paid amount, paid status, sending status).
      // Inserts and deletes are checked once per statement; updates row by row (comparing OLD with
      // NEW needs no join, which the planner would do as a nested loop over two transition tables).
      await q(`
        CREATE FUNCTION billing_lock_invoices() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE hit DATE;
        BEGIN
          IF TG_OP = 'INSERT' THEN
            SELECT n.period INTO hit FROM new_rows n JOIN billing_periods bp
              ON bp.coop_id = n.coop_id AND bp.period = n.period AND bp.status = 'closed' LIMIT 1;
            IF hit IS NOT NULL THEN RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG}; END IF;
          ELSE
            IF EXISTS (SELECT 1 FROM old_rows WHERE status <> 'draft') THEN
              RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Issued invoices are never deleted; void them with a credit note.';
            END IF;
            SELECT o.period INTO hit FROM old_rows o JOIN billing_periods bp
              ON bp.coop_id = o.coop_id AND bp.period = o.period AND bp.status = 'closed' LIMIT 1;
            IF hit IS NOT NULL THEN RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG}; END IF;
          END IF;
          RETURN NULL;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_invoices_ins AFTER INSERT ON invoices REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_invoices()`,
      );
      await q(
        `CREATE TRIGGER billing_lock_invoices_del AFTER DELETE ON invoices REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_invoices()`,
      );
      await q(`
        CREATE FUNCTION billing_lock_invoice_update() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE hit DATE := OLD.period;
        BEGIN
          IF OLD.status <> 'draft' AND (NEW.status = 'draft' OR NEW.number IS DISTINCT FROM OLD.number
              OR NEW.total_cents <> OLD.total_cents OR NEW.membership_id <> OLD.membership_id OR NEW.period <> OLD.period
              OR NEW.kind <> OLD.kind OR NEW.coop_id <> OLD.coop_id OR NEW.issued_at IS DISTINCT FROM OLD.issued_at
              OR NEW.credit_note_for_id IS DISTINCT FROM OLD.credit_note_for_id OR (OLD.status = 'void' AND NEW.status <> 'void')) THEN
            RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'An issued invoice cannot be edited; void it with a credit note and invoice again.';
          END IF;
          IF (OLD.status = 'draft' OR (NEW.status = 'void' AND OLD.status <> 'void') OR NEW.voided_at IS DISTINCT FROM OLD.voided_at
              OR NEW.due_on IS DISTINCT FROM OLD.due_on OR NEW.void_reason IS DISTINCT FROM OLD.void_reason)
             AND EXISTS (SELECT 1 FROM billing_periods bp WHERE bp.coop_id = OLD.coop_id AND bp.period = OLD.period AND bp.status = 'closed') THEN
            RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG};
          END IF;
          RETURN NEW;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_invoices_upd BEFORE UPDATE ON invoices FOR EACH ROW EXECUTE FUNCTION billing_lock_invoice_update()`,
      );

      // Lines change only while their invoice is a draft; voiding only flips "released". The
      // statement checks look invoices up by primary key (id = ANY(...)), never by a join.
      await q(`
        CREATE FUNCTION billing_lock_invoice_lines() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE r RECORD; inv_coop INTEGER; inv_status VARCHAR;
        BEGIN
          IF TG_OP = 'INSERT' THEN
            FOR r IN SELECT DISTINCT invoice_id, coop_id FROM new_rows LOOP
              SELECT coop_id, status INTO inv_coop, inv_status FROM invoices WHERE id = r.invoice_id;
              IF inv_coop IS DISTINCT FROM r.coop_id THEN
                RAISE EXCEPTION USING ERRCODE = '23503', MESSAGE = 'An invoice line must belong to its invoice''s co-op.';
              END IF;
              IF inv_status <> 'draft' THEN
                RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Lines of an issued invoice cannot change.';
              END IF;
            END LOOP;
          ELSE
            IF EXISTS (SELECT 1 FROM invoices i WHERE i.id = ANY (ARRAY(SELECT DISTINCT invoice_id FROM old_rows)) AND i.status <> 'draft') THEN
              RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Lines of an issued invoice cannot change.';
            END IF;
          END IF;
          RETURN NULL;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_invoice_lines_ins AFTER INSERT ON invoice_lines REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_invoice_lines()`,
      );
      await q(
        `CREATE TRIGGER billing_lock_invoice_lines_del AFTER DELETE ON invoice_lines REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_invoice_lines()`,
      );
      await q(`
        CREATE FUNCTION billing_lock_invoice_line_update() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE st VARCHAR;
        BEGIN
          SELECT status INTO st FROM invoices WHERE id = OLD.invoice_id;
          IF st IS DISTINCT FROM 'draft' AND NOT (st = 'void' AND OLD.released = false AND NEW.released = true
              AND NEW.amount_cents = OLD.amount_cents AND NEW.invoice_id = OLD.invoice_id AND NEW.kind = OLD.kind
              AND NEW.description = OLD.description AND NEW.draw_id IS NOT DISTINCT FROM OLD.draw_id
              AND NEW.adjustment_id IS NOT DISTINCT FROM OLD.adjustment_id AND NEW.coop_id = OLD.coop_id) THEN
            RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Lines of an issued invoice cannot change.';
          END IF;
          RETURN NEW;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_invoice_lines_upd BEFORE UPDATE ON invoice_lines FOR EACH ROW EXECUTE FUNCTION billing_lock_invoice_line_update()`,
      );

      // Payments received in a closed month: only a later refund's bookkeeping may change.
      await q(`
        CREATE FUNCTION billing_lock_payments() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE hit DATE;
        BEGIN
          IF TG_OP = 'DELETE' THEN
            RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Payments are never deleted; refund them instead.';
          END IF;
          SELECT n.period INTO hit FROM new_rows n JOIN billing_periods bp
            ON bp.coop_id = n.coop_id AND bp.period = n.period AND bp.status = 'closed' LIMIT 1;
          IF hit IS NOT NULL THEN RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG}; END IF;
          RETURN NULL;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_payments_ins AFTER INSERT ON payments REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_payments()`,
      );
      await q(
        `CREATE TRIGGER billing_lock_payments_del AFTER DELETE ON payments REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION billing_lock_payments()`,
      );
      await q(`
        CREATE FUNCTION billing_lock_payment_update() RETURNS trigger LANGUAGE plpgsql AS $$
        DECLARE hit DATE := OLD.period;
        BEGIN
          IF (NEW.amount_cents <> OLD.amount_cents OR NEW.received_on <> OLD.received_on OR NEW.method <> OLD.method
              OR NEW.membership_id <> OLD.membership_id OR NEW.invoice_id IS DISTINCT FROM OLD.invoice_id
              OR NEW.applied_cents <> OLD.applied_cents OR NEW.reference IS DISTINCT FROM OLD.reference
              OR NEW.coop_id <> OLD.coop_id OR NEW.period <> OLD.period)
             AND EXISTS (SELECT 1 FROM billing_periods bp WHERE bp.coop_id = OLD.coop_id AND bp.period = OLD.period AND bp.status = 'closed') THEN
            RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = ${CLOSED_MSG};
          END IF;
          RETURN NEW;
        END $$`);
      await q(
        `CREATE TRIGGER billing_lock_payments_upd BEFORE UPDATE ON payments FOR EACH ROW EXECUTE FUNCTION billing_lock_payment_update()`,
      );

      // A closed month stays closed; the credit ledger is append-only.
      await q(`
        CREATE FUNCTION billing_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
        BEGIN
          IF TG_TABLE_NAME = 'billing_periods' THEN
            IF OLD.status = 'closed' THEN
              RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Billing month ' || to_char(OLD.period, 'YYYY-MM') || ' is closed and cannot be reopened.';
            END IF;
            RETURN COALESCE(NEW, OLD);
          END IF;
          RAISE EXCEPTION USING ERRCODE = 'TV409', MESSAGE = 'Member credit is an append-only ledger; add a correcting entry instead.';
        END $$`);
      await q(
        `CREATE TRIGGER billing_periods_stay_closed BEFORE UPDATE OR DELETE ON billing_periods FOR EACH ROW EXECUTE FUNCTION billing_refuse_change()`,
      );
      await q(
        `CREATE TRIGGER member_credits_append_only BEFORE UPDATE OR DELETE ON member_credits FOR EACH ROW EXECUTE FUNCTION billing_refuse_change()`,
      );
    });
  },

  async down(queryInterface) {
    await queryInterface.sequelize.transaction(async (transaction) => {
      const q = (sql) => queryInterface.sequelize.query(sql, { transaction });
      for (const t of ['billing_lock_draws_ins', 'billing_lock_draws_upd', 'billing_lock_draws_del'])
        await q(`DROP TRIGGER ${t} ON draws`);
      for (const t of [
        'payment_webhook_events',
        'member_credits',
        'refunds',
        'payments',
        'payment_attempts',
        'invoice_lines',
        'invoices',
        'billing_adjustments',
        'billing_runs',
        'invoice_counters',
        'billing_periods',
      ]) {
        await q(`DROP TABLE ${t}`);
      }
      for (const f of [
        'billing_refuse_change()',
        'billing_lock_payment_update()',
        'billing_lock_payments()',
        'billing_lock_invoice_line_update()',
        'billing_lock_invoice_lines()',
        'billing_lock_invoice_update()',
        'billing_lock_invoices()',
        'billing_lock_draws()',
      ]) {
        await q(`DROP FUNCTION ${f}`);
      }
    });
  },
};
