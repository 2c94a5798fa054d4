import type { Knex } from "knex";

// The chain head's update guard (20261204000200_ledger_chains_guarded) with the
// same checks and messages, finding the named row once instead of twice: it now
// runs on every append, and each lookup inside a trigger is planned anew.

const ADVANCE_ONLY_ONE_LOOKUP = `CREATE OR REPLACE TRIGGER ledger_chains_advance_only BEFORE UPDATE ON ledger_chains
    FOR EACH ROW
    BEGIN
      IF BINARY NEW.chain_key <> BINARY OLD.chain_key THEN
        SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head cannot be renamed';
      END IF;
      IF NEW.last_seq <> OLD.last_seq OR BINARY NEW.last_hash <> BINARY OLD.last_hash THEN
        IF NEW.last_seq <> OLD.last_seq + 1 THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head only advances by one row';
        END IF;
        IF NOT EXISTS (SELECT 1 FROM ledger_entries
            WHERE chain_key = NEW.chain_key AND chain_seq = NEW.last_seq
              AND BINARY hash = BINARY NEW.last_hash AND BINARY prev_hash = BINARY OLD.last_hash) THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head must name its next stored row, linked to the old head';
        END IF;
      END IF;
    END`;

const ADVANCE_ONLY_TWO_LOOKUPS = `CREATE OR REPLACE TRIGGER ledger_chains_advance_only BEFORE UPDATE ON ledger_chains
    FOR EACH ROW
    BEGIN
      DECLARE row_hash CHAR(64);
      DECLARE row_prev CHAR(64);
      IF BINARY NEW.chain_key <> BINARY OLD.chain_key THEN
        SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head cannot be renamed';
      END IF;
      IF NEW.last_seq <> OLD.last_seq OR BINARY NEW.last_hash <> BINARY OLD.last_hash THEN
        IF NEW.last_seq <> OLD.last_seq + 1 THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head only advances by one row';
        END IF;
        SET row_hash = (SELECT hash FROM ledger_entries
          WHERE chain_key = NEW.chain_key AND chain_seq = NEW.last_seq);
        SET row_prev = (SELECT prev_hash FROM ledger_entries
          WHERE chain_key = NEW.chain_key AND chain_seq = NEW.last_seq);
        IF row_hash IS NULL OR BINARY row_hash <> BINARY NEW.last_hash
            OR BINARY row_prev <> BINARY OLD.last_hash THEN
          SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head must name its next stored row, linked to the old head';
        END IF;
      END IF;
    END`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(ADVANCE_ONLY_ONE_LOOKUP);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(ADVANCE_ONLY_TWO_LOOKUPS);
}
