package settle.datasets.table;

import java.util.List;
import tech.tablesaw.api.DoubleColumn;
import tech.tablesaw.api.StringColumn;
import tech.tablesaw.columns.Column;

/**
 * A CSV table as read, before any choice of features: every column typed (a tablesaw {@link DoubleColumn} when
 * each of its non-missing cells is a number, else a {@link StringColumn} of text), missing cells marked missing
 * (NaN, or tablesaw's missing string), and the label column turned into class numbers. {@link TableReader} makes
 * it; {@link TableEncoder} turns it into a dataset.
 *
 * <p>Row indices are 0-based data rows in file order. Columns are indexed as in the header; the label column has
 * no tablesaw column. A table is read by one thread and then only read; its columns are never handed out.
 */
public final class SourceTable {

    /** What the reader saw in one column, for messages and for {@code settle check}. */
    record ColumnFacts(int missing, long firstMissingLine, int numberCells, int textCells, long firstTextLine,
            String firstText, int notationCells, long firstNotationLine, String firstNotation) {
    }

    private final String name;
    private final List<String> columnNames;
    private final int labelColumn;
    private final long headerLine;
    private final Column<?>[] columns;
    private final boolean[] numeric;
    private final ColumnFacts[] facts;
    private final int[] labels;
    private final List<String> classNames;
    private boolean released;

    SourceTable(String name, List<String> columnNames, int labelColumn, long headerLine, Column<?>[] columns,
            ColumnFacts[] facts, int[] labels, List<String> classNames) {
        this.name = name;
        this.columnNames = List.copyOf(columnNames);
        this.labelColumn = labelColumn;
        this.headerLine = headerLine;
        this.columns = columns;
        this.numeric = new boolean[columns.length];
        for (int c = 0; c < columns.length; c++) {
            numeric[c] = columns[c] instanceof DoubleColumn;
        }
        this.facts = facts;
        this.labels = labels;
        this.classNames = List.copyOf(classNames);
    }

    /** @return how the file is named in messages (the path as the user wrote it) */
    public String name() {
        return name;
    }

    /** @return every column's header name, in file order (the label's included) */
    public List<String> columnNames() {
        return columnNames;
    }

    /** @return the label column's index */
    public int labelColumn() {
        return labelColumn;
    }

    /** @return the label column's header name */
    public String labelName() {
        return columnNames.get(labelColumn);
    }

    /** @return the line of the header row */
    public long headerLine() {
        return headerLine;
    }

    /** @return the number of data rows */
    public int rows() {
        return labels.length;
    }

    /** @return the class names, class 0 first (numeric labels numerically, text lexically) */
    public List<String> classNames() {
        return classNames;
    }

    /** @return a fresh copy of every row's class, in 0..K−1 */
    public int[] labels() {
        return labels.clone();
    }

    /** @return row {@code row}'s class */
    int label(int row) {
        return labels[row];
    }

    /** @return true when every non-missing cell of column {@code c} is a number (never for the label) */
    public boolean numeric(int c) {
        return numeric[c];
    }

    /** @return column {@code c}'s values, NaN where missing; only for {@link #numeric} columns */
    DoubleColumn numbers(int c) {
        return (DoubleColumn) columns[c];
    }

    /** @return column {@code c}'s text, tablesaw's missing string where missing; only for text columns */
    StringColumn texts(int c) {
        return (StringColumn) columns[c];
    }

    /** @return true when row {@code row} of feature column {@code c} is missing */
    boolean missing(int c, int row) {
        return columns[c].isMissing(row);
    }

    /**
     * Lets column {@code c}'s values go once they are encoded, so that the table and the dataset made from it are
     * not both held in full; the table cannot be encoded again afterwards.
     */
    void release(int c) {
        columns[c] = null;
        released = true;
    }

    /** @return true once a column was released: the table was encoded and cannot be again */
    boolean released() {
        return released;
    }

    /** @return what the reader saw in column {@code c} (not the label) */
    ColumnFacts facts(int c) {
        return facts[c];
    }

    /** @return the number of missing cells in column {@code c} over every row (0 for the label) */
    public int missingCells(int c) {
        return c == labelColumn ? 0 : facts[c].missing();
    }
}
