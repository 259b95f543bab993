package settle.datasets;

import java.util.List;
import settle.datasets.table.TableReport;

/**
 * A data source read, encoded and split the one way every command does it: the rows kept, in file order, and which
 * of them form each split.
 *
 * @param all every kept row (for a CSV table: encoded with what was fitted on the training rows alone)
 * @param train the training rows, ascending indices into {@code all}
 * @param holdout the holdout rows, ascending indices into {@code all}; empty without a holdout
 * @param test the test rows, ascending indices into {@code all}; empty without a test split
 * @param table what became of a CSV table's columns and splits; null for other sources
 * @param warnings one line each (likely IDs, text columns that are mostly numbers, dropped rows, unseen values)
 */
public record PreparedData(Dataset all, int[] train, int[] holdout, int[] test, TableReport table,
        List<String> warnings) {

    /** Copies the warnings. */
    public PreparedData {
        warnings = List.copyOf(warnings);
    }
}
