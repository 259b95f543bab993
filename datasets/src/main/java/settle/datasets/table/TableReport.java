package settle.datasets.table;

import java.util.List;

/**
 * What became of a table: every column with its type, role, missing cells and encoding, the rows each split kept,
 * and the cells each split imputed or could not encode. {@code settle check} prints it.
 *
 * @param source how the file is named
 * @param rows the data rows read
 * @param columns every column of the file, in file order
 * @param encoding the fitted encoding of the feature columns
 * @param parts the splits, training first (then holdout and test when there are such rows)
 * @param classNames the classes, class 0 first
 * @param missing the plan's rule for missing cells
 */
public record TableReport(String source, int rows, List<ColumnReport> columns, Encoding encoding,
        List<PartReport> parts, List<String> classNames, TableOptions.Missing missing) {

    /** Copies the lists. */
    public TableReport {
        columns = List.copyOf(columns);
        parts = List.copyOf(parts);
        classNames = List.copyOf(classNames);
    }

    /** What a column is to the study. */
    public enum Role {
        /** the class label */
        LABEL,
        /** a feature */
        FEATURE,
        /** taken out by {@code data.drop} */
        DROPPED,
        /** not listed in {@code data.features} */
        UNLISTED
    }

    /**
     * One column of the file.
     *
     * @param name its header name
     * @param numeric true when every non-missing cell is a number
     * @param role label, feature, dropped or not listed
     * @param missing its missing cells over every row read
     * @param feature its encoding when it is a feature, else null
     */
    public record ColumnReport(String name, boolean numeric, Role role, int missing, Encoding.Feature feature) {
    }

    /**
     * One split after the missing-value rule.
     *
     * @param name training, holdout or test
     * @param rows the rows it kept
     * @param dropped the rows {@code data.missing: drop-rows} took out of it
     * @param classCounts its rows per class
     * @param imputed per feature column (encoding order), the cells filled with the training median or level
     * @param unseen per feature column (encoding order), the cells whose value training never saw, encoded as zeros
     */
    public record PartReport(String name, int rows, int dropped, int[] classCounts, int[] imputed, int[] unseen) {
    }
}
