package settle.datasets.io;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import settle.input.BadInputException;

/**
 * Collects the label of each row while a file streams by, then numbers the classes as DESIGN.md says: the
 * distinct labels in sorted order, numerically when every label is a number (so {@code 1} and {@code 1.0}
 * are one class), lexically (by UTF-16 code units) otherwise.
 */
public final class LabelIndex {

    private final Map<String, Integer> codes = new HashMap<>();
    private final List<String> spellings = new ArrayList<>();
    private int[] rowCodes = new int[1024];
    private int rows;

    private List<String> classNames;
    private int[] labels;
    private boolean numeric;

    /** Records the (already stripped) label of the next row. */
    public void add(String label) {
        Integer code = codes.get(label);
        if (code == null) {
            code = spellings.size();
            codes.put(label, code);
            spellings.add(label);
        }
        if (rows == rowCodes.length) {
            rowCodes = Arrays.copyOf(rowCodes, Math.max(16, rows * 2));
        }
        rowCodes[rows++] = code;
    }

    /** @return the number of rows recorded */
    public int rows() {
        return rows;
    }

    /**
     * Numbers the classes as {@link #finish()} does, refusing first a file without data rows and then one whose
     * label column holds a single class: the checks of both readers of delimited text ({@link CsvReader} and the
     * table reader), said in the same words.
     *
     * @param src the file as messages name it
     * @param headerLine the header's line number
     * @param labelName the label column's name
     * @throws BadInputException when there is no row or only one class
     */
    public void finish(String src, long headerLine, String labelName) {
        if (rows == 0) {
            throw BadInputException.of("", src + ": no data rows after the header (line " + headerLine
                    + "); expected at least one row");
        }
        finish();
        if (classNames.size() < 2) {
            throw BadInputException.of("", src + ": label column " + BadInputException.shown(labelName)
                    + " holds one class only (" + BadInputException.shown(classNames.get(0))
                    + "); expected at least two classes");
        }
    }

    /** Numbers the classes; call once, after the last {@link #add}. */
    public void finish() {
        int distinct = spellings.size();
        boolean numeric = true;
        double[] values = new double[distinct];
        for (int i = 0; i < distinct && numeric; i++) {
            String s = spellings.get(i);
            if (Numbers.classify(s) == Numbers.OK) {
                values[i] = Numbers.parse(s) + 0.0; // -0.0 and 0.0 are one class
            } else {
                numeric = false;
            }
        }
        int[] remap = new int[distinct];
        List<String> names = new ArrayList<>();
        if (numeric) {
            double[] sorted = values.clone();
            Arrays.sort(sorted);
            int k = 0;
            double[] uniq = new double[distinct];
            for (int i = 0; i < distinct; i++) {
                if (i == 0 || sorted[i] != sorted[i - 1]) {
                    uniq[k++] = sorted[i];
                    names.add(Numbers.labelName(sorted[i]));
                }
            }
            for (int i = 0; i < distinct; i++) {
                remap[i] = Arrays.binarySearch(uniq, 0, k, values[i]);
            }
        } else {
            String[] sorted = spellings.toArray(new String[0]);
            Arrays.sort(sorted);
            names.addAll(Arrays.asList(sorted));
            for (int i = 0; i < distinct; i++) {
                remap[i] = Arrays.binarySearch(sorted, spellings.get(i));
            }
        }
        int[] out = new int[rows];
        for (int r = 0; r < rows; r++) {
            out[r] = remap[rowCodes[r]];
        }
        classNames = List.copyOf(names);
        labels = out;
        rowCodes = null;
        this.numeric = numeric;
    }

    /** @return true when every label is a number (after {@link #finish}) */
    public boolean numeric() {
        return numeric;
    }

    /**
     * The most distinct numeric labels a table of {@code rows} rows may have before it looks like a regression
     * target rather than classes: max(20, 5 % of the rows).
     *
     * @param rows the number of labelled rows
     * @return the cap
     */
    public static long regressionCap(int rows) {
        return Math.max(20L, (long) Math.floor(0.05 * rows));
    }

    /**
     * @return a one-line problem when the labels are numbers with more distinct values than
     *         {@link #regressionCap}, else null (after {@link #finish})
     */
    public String regressionProblem() {
        long cap = regressionCap(rows);
        if (!numeric || classNames.size() <= cap) {
            return null;
        }
        return classNames.size() + " distinct numbers in " + rows + " rows, more than max(20, 5 % of the rows) = "
                + cap + ": looks like a regression target; settle trains classifiers; expected class labels";
    }

    /** @return the class names, class 0 first (after {@link #finish}) */
    public List<String> classNames() {
        return classNames;
    }

    /** @return the label of each row in 0..K−1 (after {@link #finish}); the array is handed over */
    public int[] labels() {
        return labels;
    }
}
