/**
 * Plan variants: a comparison saved from the planning screen keeps both plans. The second plan
 * (the variant) names the first plan's original row in `variant_of`; a correction keeps it.
 * Which plan of a comparison the clinic will use is a row in `plan_choices`, added and never
 * changed: the newest row for a comparison is its choice, so a comparison has one chosen plan.
 * Both columns hold a chain's first row id, which stays the same through corrections.
 */
export const planVariantsMigration = {
  version: 8,
  name: 'plan-variants',
  sql: `
    ALTER TABLE plans ADD COLUMN variant_of INTEGER REFERENCES plans (id);
    CREATE INDEX plans_variant_of ON plans (variant_of);

    CREATE TABLE plan_choices (
      id INTEGER PRIMARY KEY,
      comparison_id INTEGER NOT NULL REFERENCES plans (id),
      chosen_id INTEGER NOT NULL REFERENCES plans (id),
      entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
      entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80),
      reason TEXT NOT NULL DEFAULT '' CHECK (length(reason) <= 500)
    ) STRICT;
    CREATE INDEX plan_choices_comparison ON plan_choices (comparison_id);
    CREATE TRIGGER plan_choices_never_updated BEFORE UPDATE ON plan_choices
      BEGIN SELECT RAISE(ABORT, 'plan_choices rows are never changed in place; add a new choice'); END;
    CREATE TRIGGER plan_choices_never_deleted BEFORE DELETE ON plan_choices
      BEGIN SELECT RAISE(ABORT, 'plan_choices rows are never deleted; add a new choice'); END;
  `,
} as const;
