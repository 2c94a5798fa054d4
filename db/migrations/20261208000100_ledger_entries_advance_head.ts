import type { Knex } from "knex";

// Storing a ledger row moves its chain head onto it in the same statement, so
// an append is one INSERT instead of an INSERT and an UPDATE (one round trip
// less per clinical write). The head is still written by every append: two
// appends on one head still conflict (a lock wait here, a certification
// failure between two primaries). The head's own triggers
// (20261204000200_ledger_chains_guarded) still check the move: by one row, onto
// a stored row linked to the old head. A row whose chain has no head, or whose
// key differs from the head's only in case, is refused.

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TRIGGER ledger_entries_advance_head AFTER INSERT ON ledger_entries
    FOR EACH ROW
    BEGIN
      UPDATE ledger_chains SET last_seq = NEW.chain_seq, last_hash = NEW.hash
        WHERE chain_key = NEW.chain_key AND BINARY chain_key = BINARY NEW.chain_key;
      IF ROW_COUNT() <> 1 THEN
        SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries: a row needs its chain head, which it advances';
      END IF;
    END`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER IF EXISTS ledger_entries_advance_head");
}
