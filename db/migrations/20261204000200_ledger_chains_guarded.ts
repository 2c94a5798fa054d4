import type { Knex } from "knex";

// Chain heads may only move forward one stored row at a time, and never
// disappear: otherwise the application's account could rewind a head (to hide
// rows, or to fork the chain) or delete it. Triggers hold for every account;
// the application's account still needs only SELECT, INSERT and UPDATE here.
// Hashes and keys compare as bytes, not under the case-insensitive collation.

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TRIGGER ledger_chains_start_at_genesis BEFORE INSERT ON ledger_chains
    FOR EACH ROW
    IF NEW.last_seq <> 0 OR BINARY NEW.last_hash <> BINARY REPEAT('0', 64) THEN
      SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a new chain head starts at row 0';
    END IF`);
  // appendLedger's "INSERT … ON DUPLICATE KEY UPDATE chain_key = chain_key"
  // fires this with nothing changed while taking the lock; that stays allowed.
  await knex.raw(`CREATE TRIGGER ledger_chains_advance_only BEFORE UPDATE ON ledger_chains
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
    END`);
  await knex.raw(`CREATE TRIGGER ledger_chains_no_delete BEFORE DELETE ON ledger_chains
    FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_chains: a chain head cannot be deleted'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS ledger_chains_no_delete");
  await knex.raw("DROP TRIGGER IF EXISTS ledger_chains_advance_only");
  await knex.raw("DROP TRIGGER IF EXISTS ledger_chains_start_at_genesis");
}
