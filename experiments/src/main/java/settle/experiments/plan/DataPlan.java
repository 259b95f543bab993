package settle.experiments.plan;

import java.util.Objects;
import settle.datasets.table.TableOptions;

/**
 * Where a plan's data come from and how they are split.
 *
 * @param source {@code bundled:NAME}, {@code synthetic:GENERATOR}, or {@code csv:PATH} / {@code libsvm:PATH}
 *        with PATH absolute (the parser resolves it against the plan file's folder)
 * @param label the label column of a CSV file, or null for the reader's default (bundled data know theirs)
 * @param testFraction fraction of the rows held out as the test split, stratified, in (0, 1) in a plan file; 0 (no
 *        test split) only in the plan {@code settle trace} builds from its options to replay a run made elsewhere
 * @param holdoutFraction fraction of the training split carved out as the holdout split (what plateau arms
 *        may judge), in [0, 1)
 * @param standardize true to z-score every feature with the training split's mean and population s.d.
 * @param table a CSV table's {@code features}, {@code drop}, {@code categorical}, {@code max-levels} and
 *        {@code missing} ({@link TableOptions#DEFAULTS} for every other source)
 */
public record DataPlan(String source, String label, double testFraction, double holdoutFraction, boolean standardize,
        TableOptions table) {

    /** A plan's data without any of the table keys. */
    public DataPlan(String source, String label, double testFraction, double holdoutFraction, boolean standardize) {
        this(source, label, testFraction, holdoutFraction, standardize, TableOptions.DEFAULTS);
    }

    public DataPlan {
        Objects.requireNonNull(source, "source");
        Objects.requireNonNull(table, "table");
        if (!(testFraction >= 0 && testFraction < 1)) {
            throw new IllegalArgumentException("test-fraction must be in [0, 1): " + testFraction);
        }
        if (!(holdoutFraction >= 0 && holdoutFraction < 1)) {
            throw new IllegalArgumentException("holdout-fraction must be in [0, 1): " + holdoutFraction);
        }
    }
}
