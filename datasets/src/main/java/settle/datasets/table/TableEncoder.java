package settle.datasets.table;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import settle.input.BadInputException;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.datasets.io.Numbers;
import tech.tablesaw.api.DoubleColumn;
import tech.tablesaw.api.StringColumn;

/**
 * Turns a {@link SourceTable} into a {@link PreparedData} under a plan's {@link TableOptions}, given which rows
 * form each split:
 * <ol>
 *   <li>the feature columns: {@code data.features} (default every column but the label), less {@code data.drop};
 *       categorical are the text columns and those in {@code data.categorical};</li>
 *   <li>missing cells of feature columns: refused with their counts ({@code refuse}), or their rows dropped from
 *       each split ({@code drop-rows}), or filled ({@code impute});</li>
 *   <li>the {@link Encoding} fitted on the training rows alone (levels, medians, which columns get a "was missing"
 *       input), and refused for a categorical column with more than {@code data.max-levels} levels;</li>
 *   <li>every kept row encoded with it into one row-major matrix, values unseen in training as zeros.</li>
 * </ol>
 * Nothing about the holdout or test rows reaches the encoding. The table's columns are let go as they are encoded
 * (peak memory: the table's numbers and the matrix, about two copies of the data), so a table is prepared once.
 */
public final class TableEncoder {

    /** Tables with fewer rows get no "a different value in every row" warning. */
    static final int ID_WARNING_ROWS = 20;

    /** The missing-cell spellings, as messages list them. */
    static final String MISSING_SPELLINGS = "empty, NA, N/A, NaN, null, none or ?";

    /** The most values one dataset may hold (one Java array). */
    static final long MAX_VALUES = Integer.MAX_VALUE - 16L;

    private TableEncoder() {
    }

    /**
     * @param table the table as read; its columns are released (it cannot be prepared again)
     * @param options the plan's column and missing-value keys
     * @param train the training rows, ascending indices into the table
     * @param holdout the holdout rows, ascending (empty for none)
     * @param test the test rows, ascending (empty for none)
     * @return the encoded rows and splits
     * @throws BadInputException for a key naming no column or the label, missing cells under {@code refuse}, a
     *         categorical column with too many levels, a column without values in training, or a class left
     *         without training rows; {@link BadInputException#key()} names the plan key
     */
    public static PreparedData prepare(SourceTable table, TableOptions options, int[] train, int[] holdout,
            int[] test) {
        if (table.released()) {
            throw new IllegalStateException(table.name() + " was encoded already");
        }
        String src = table.name();
        List<Integer> features = features(table, options);
        Set<Integer> forced = new HashSet<>(indices(table, options.categorical(), "categorical"));
        for (int c : forced) {
            if (!features.contains(c)) {
                throw BadInputException.of("data.categorical", src + ": data.categorical names "
                        + BadInputException.shown(table.columnNames().get(c)) + ", which is not a feature ("
                        + (c == table.labelColumn() ? "it is the label" : options.drop().contains(
                                table.columnNames().get(c)) ? "data.drop takes it out" : "data.features leaves it out")
                        + "); expected feature columns only");
            }
        }

        int[][] parts = {train, holdout, test};
        int[] dropped = new int[3];
        switch (options.missing()) {
            case REFUSE -> refuseMissing(table, features);
            case DROP_ROWS -> {
                for (int p = 0; p < 3; p++) {
                    int[] kept = complete(table, features, parts[p]);
                    dropped[p] = parts[p].length - kept.length;
                    parts[p] = kept;
                }
            }
            case IMPUTE -> { }
            default -> throw new IllegalStateException();
        }
        String[] partNames = {"training", "holdout", "test"};
        int[][] given = {train, holdout, test};
        for (int p = 0; p < 3; p++) {
            if (given[p].length > 0 && parts[p].length == 0) {
                throw BadInputException.of("data.missing", src + ": data.missing: drop-rows dropped all " + given[p].length
                        + " " + partNames[p] + " rows; expected some left (data.missing: impute, or data.drop the"
                        + " columns with the most gaps)");
            }
        }
        if (options.missing() == TableOptions.Missing.DROP_ROWS) {
            checkTrainingClasses(table, parts[0], dropped[0]);
        }
        if (options.missing() == TableOptions.Missing.DROP_ROWS) {
            checkTrainingClasses(table, parts[0], dropped[0]);
        }

        List<Encoding.Feature> fitted = new ArrayList<>();
        for (int c : features) {
            fitted.add(fit(table, c, forced.contains(c), options, parts[0], parts[1], parts[2]));
        }
        Encoding encoding = new Encoding(fitted);
        List<String> warnings = new ArrayList<>(columnWarnings(table, features, forced));

        int[] kept = union(parts);
        int width = encoding.width();
        if ((long) kept.length * width > MAX_VALUES) {
            throw BadInputException.of("data.features", src + ": " + kept.length + " rows × " + width
                    + " encoded columns is more than " + MAX_VALUES + " values; expected a dataset that fits one"
                    + " Java array (fewer columns: data.drop, data.max-levels)");
        }
        int[][] imputed = new int[3][features.size()];
        int[][] unseen = new int[3][features.size()];
        int[] partOf = new int[table.rows()];
        Arrays.fill(partOf, -1);
        for (int p = 0; p < 3; p++) {
            for (int r : parts[p]) {
                partOf[r] = p;
            }
        }
        double[] x = new double[kept.length * width];
        int offset = 0;
        for (int j = 0; j < features.size(); j++) {
            encode(table, features.get(j), encoding.columns().get(j), kept, partOf, x, width, offset,
                    imputed, unseen, j);
            offset += encoding.columns().get(j).width();
            table.release(features.get(j));
        }
        int[] labels = new int[kept.length];
        for (int k = 0; k < kept.length; k++) {
            labels[k] = table.label(kept[k]);
        }
        Dataset all = new Dataset(src, x, labels, encoding.outputs(), table.classNames());
        x = null; // the dataset holds its own copy

        List<TableReport.PartReport> partReports = new ArrayList<>();
        int[][] positions = new int[3][];
        for (int p = 0; p < 3; p++) {
            positions[p] = positions(kept, parts[p]);
            if (p == 0 || parts[p].length > 0 || dropped[p] > 0) {
                int[] counts = new int[table.classNames().size()];
                for (int r : parts[p]) {
                    counts[table.label(r)]++;
                }
                partReports.add(new TableReport.PartReport(partNames[p], parts[p].length, dropped[p], counts,
                        imputed[p], unseen[p]));
            }
        }
        if (options.missing() == TableOptions.Missing.DROP_ROWS && (dropped[0] + dropped[1] + dropped[2]) > 0) {
            warnings.add(src + ": data.missing: drop-rows dropped " + dropped[0] + " of " + train.length + " training"
                    + (holdout.length > 0 ? ", " + dropped[1] + " of " + holdout.length + " holdout" : "")
                    + (test.length > 0 ? ", " + dropped[2] + " of " + test.length + " test" : "") + " rows");
        }
        for (int p = 1; p < 3; p++) {
            for (int j = 0; j < features.size(); j++) {
                if (unseen[p][j] > 0) {
                    warnings.add(src + ": " + partNames[p] + " split: " + unseen[p][j] + " cell"
                            + (unseen[p][j] == 1 ? " of " : "s of ") + BadInputException.shown(encoding.columns().get(j)
                            .name()) + (unseen[p][j] == 1 ? " holds" : " hold") + " a value (or gap) the training"
                            + " split does not have; encoded as zeros");
                }
            }
        }
        List<TableReport.ColumnReport> columns = new ArrayList<>();
        Set<String> dropSet = new HashSet<>(options.drop());
        for (int c = 0; c < table.columnNames().size(); c++) {
            String name = table.columnNames().get(c);
            TableReport.Role role;
            Encoding.Feature f = null;
            if (c == table.labelColumn()) {
                role = TableReport.Role.LABEL;
            } else if (features.contains(c)) {
                role = TableReport.Role.FEATURE;
                f = encoding.columns().get(features.indexOf(c));
            } else if (dropSet.contains(name)) {
                role = TableReport.Role.DROPPED;
            } else {
                role = TableReport.Role.UNLISTED;
            }
            columns.add(new TableReport.ColumnReport(name, c != table.labelColumn() && table.numeric(c), role,
                    table.missingCells(c), f));
        }
        TableReport report = new TableReport(src, table.rows(), columns, encoding, partReports, table.classNames(),
                options.missing());
        return new PreparedData(all, positions[0], positions[1], positions[2], report, warnings);
    }

    // ------------------------------------------------------------------ which columns

    private static List<Integer> features(SourceTable table, TableOptions options) {
        String src = table.name();
        List<Integer> features = new ArrayList<>();
        if (options.features() == null) {
            for (int c = 0; c < table.columnNames().size(); c++) {
                if (c != table.labelColumn()) {
                    features.add(c);
                }
            }
        } else {
            for (int c : indices(table, options.features(), "features")) {
                if (c == table.labelColumn()) {
                    throw BadInputException.of("data.features", src + ": data.features names the label column "
                            + BadInputException.shown(table.labelName()) + "; expected feature columns only");
                }
                features.add(c);
            }
        }
        for (int c : indices(table, options.drop(), "drop")) {
            if (c == table.labelColumn()) {
                throw BadInputException.of("data.drop", src + ": data.drop names the label column "
                        + BadInputException.shown(table.labelName()) + "; expected feature columns only");
            }
            if (!features.remove(Integer.valueOf(c))) {
                throw BadInputException.of("data.drop", src + ": data.drop names " + BadInputException.shown(
                        table.columnNames().get(c)) + ", which data.features does not list; expected a feature");
            }
        }
        if (features.isEmpty()) {
            throw BadInputException.of(options.drop().isEmpty() ? "data.features" : "data.drop", src
                    + ": no feature column is left; expected at least one");
        }
        return features;
    }

    private static List<Integer> indices(SourceTable table, List<String> names, String key) {
        List<Integer> out = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (String name : names) {
            if (!seen.add(name)) {
                throw BadInputException.of("data." + key, table.name() + ": data." + key + " names "
                        + BadInputException.shown(name) + " twice; expected each column once");
            }
            int c = table.columnNames().indexOf(name);
            if (c < 0) {
                throw BadInputException.of("data." + key, table.name() + ": data." + key + " names " + BadInputException.shown(name)
                        + ", which is not a column; expected one of: " + String.join(", ", table.columnNames()));
            }
            out.add(c);
        }
        return out;
    }

    // ------------------------------------------------------------------ missing cells

    private static void refuseMissing(SourceTable table, List<Integer> features) {
        int rowsWithGaps = 0;
        int[] columns = features.stream().mapToInt(Integer::intValue).filter(c -> table.missingCells(c) > 0).toArray();
        if (columns.length == 0) {
            return;
        }
        for (int r = 0; r < table.rows(); r++) {
            for (int c : columns) {
                if (table.missing(c, r)) {
                    rowsWithGaps++;
                    break;
                }
            }
        }
        StringBuilder b = new StringBuilder(table.name()).append(": missing cells (").append(MISSING_SPELLINGS)
                .append(") in ").append(rowsWithGaps).append(" of ").append(table.rows()).append(" rows: ");
        int shown = Math.min(columns.length, 8);
        for (int i = 0; i < shown; i++) {
            int c = columns[i];
            if (i > 0) {
                b.append(", ");
            }
            b.append(BadInputException.shown(table.columnNames().get(c))).append(' ').append(table.missingCells(c))
                    .append(" (first on line ").append(table.facts(c).firstMissingLine()).append(')');
        }
        if (columns.length > shown) {
            b.append(" and ").append(columns.length - shown).append(" more columns");
        }
        b.append("; expected none under data.missing: refuse (the default), or data.missing: drop-rows (drops those"
                + " rows from each split) or impute (training medians plus a was-missing column for numbers, a level"
                + " of its own for categories)");
        throw BadInputException.of("data.missing", b.toString());
    }

    /** @return the rows of {@code rows} without a missing feature cell */
    private static int[] complete(SourceTable table, List<Integer> features, int[] rows) {
        int[] columns = features.stream().mapToInt(Integer::intValue).filter(c -> table.missingCells(c) > 0).toArray();
        int[] out = new int[rows.length];
        int n = 0;
        for (int r : rows) {
            boolean gap = false;
            for (int i = 0; i < columns.length && !gap; i++) {
                gap = table.missing(columns[i], r);
            }
            if (!gap) {
                out[n++] = r;
            }
        }
        return Arrays.copyOf(out, n);
    }

    private static void checkTrainingClasses(SourceTable table, int[] train, int dropped) {
        int[] counts = new int[table.classNames().size()];
        for (int r : train) {
            counts[table.label(r)]++;
        }
        for (int k = 0; k < counts.length; k++) {
            if (counts[k] == 0) {
                throw BadInputException.of("data.missing", table.name() + ": data.missing: drop-rows dropped " + dropped
                        + " training rows and left class " + BadInputException.shown(table.classNames().get(k))
                        + " without any; expected every class in training (data.missing: impute, or data.drop the"
                        + " columns with the most gaps)");
            }
        }
    }

    // ------------------------------------------------------------------ fitting on training rows

    private static Encoding.Feature fit(SourceTable table, int c, boolean forced, TableOptions options, int[] train,
            int[] holdout, int[] test) {
        String name = table.columnNames().get(c);
        boolean impute = options.missing() == TableOptions.Missing.IMPUTE;
        int trainingGaps = 0;
        for (int r : train) {
            if (table.missing(c, r)) {
                trainingGaps++;
            }
        }
        if (table.numeric(c) && !forced) {
            double median = Double.NaN;
            if (impute && (trainingGaps > 0 || anyMissing(table, c, holdout) || anyMissing(table, c, test))) {
                median = median(table.numbers(c), train);
                if (Double.isNaN(median)) {
                    throw BadInputException.of("data.drop", table.name() + ": column " + BadInputException.shown(name)
                            + " has no values in the training split, so it has no median to impute; expected it"
                            + " in data.drop");
                }
            }
            return new Encoding.Feature(name, Encoding.Kind.NUMBER, false, List.of(), false, median,
                    impute && trainingGaps > 0);
        }
        SourceTable.ColumnFacts facts = table.facts(c);
        if (!table.numeric(c) && !forced && facts.textCells() == 0) {
            // numbers in another notation (1,5  12%  4.5d): a column of numbers the file spells differently
            throw BadInputException.of("data.categorical", BadInputException.atCell(table.name(), facts.firstNotationLine(),
                    c + 1, name, "expected a number, found " + BadInputException.shown(facts.firstNotation())
                    + "; settle reads numbers with a decimal point and without thousands separators, '%' or"
                    + " suffixes: convert the column, or list it in data.categorical if it holds categories")
                    .getMessage());
        }
        List<String> levels;
        if (table.numeric(c)) {
            TreeSet<Double> values = new TreeSet<>();
            DoubleColumn col = table.numbers(c);
            for (int r : train) {
                double v = col.getDouble(r);
                if (!Double.isNaN(v)) {
                    values.add(v + 0.0); // -0.0 and 0.0 are one level
                }
            }
            levels = new ArrayList<>();
            for (double v : values) {
                levels.add(Numbers.labelName(v));
            }
        } else {
            TreeSet<String> values = new TreeSet<>();
            StringColumn col = table.texts(c);
            for (int r : train) {
                if (!col.isMissing(r)) {
                    values.add(col.get(r));
                }
            }
            levels = new ArrayList<>(values);
        }
        if (levels.size() > options.maxLevels()) {
            throw BadInputException.of("data.max-levels", table.name() + ": categorical column " + BadInputException.shown(name)
                    + " has " + levels.size() + " distinct values in the training split, more than data.max-levels ("
                    + options.maxLevels() + "): likely an ID or free text" + textHint(table, c)
                    + "; expected it in data.drop, or a larger data.max-levels");
        }
        return new Encoding.Feature(name, Encoding.Kind.CATEGORY, !table.numeric(c), levels,
                impute && trainingGaps > 0, Double.NaN, false);
    }

    /** Says why a text column of mostly numbers is text. */
    private static String textHint(SourceTable table, int c) {
        SourceTable.ColumnFacts f = table.facts(c);
        if (table.numeric(c) || f.numberCells() <= f.textCells()) {
            return "";
        }
        return " (it is text because of " + BadInputException.shown(f.firstText()) + " on line " + f.firstTextLine()
                + "; " + f.numberCells() + " of its cells are numbers)";
    }

    private static boolean anyMissing(SourceTable table, int c, int[] rows) {
        for (int r : rows) {
            if (table.missing(c, r)) {
                return true;
            }
        }
        return false;
    }

    /** @return the median of the non-missing values of {@code rows}: the middle one, or the mean of the middle two */
    static double median(DoubleColumn column, int[] rows) {
        double[] v = new double[rows.length];
        int n = 0;
        for (int r : rows) {
            double x = column.getDouble(r);
            if (!Double.isNaN(x)) {
                v[n++] = x;
            }
        }
        if (n == 0) {
            return Double.NaN;
        }
        Arrays.sort(v, 0, n);
        return n % 2 == 1 ? v[n / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
    }

    // ------------------------------------------------------------------ encoding every kept row

    private static void encode(SourceTable table, int c, Encoding.Feature f, int[] kept, int[] partOf, double[] x,
            int width, int offset, int[][] imputed, int[][] unseen, int j) {
        if (f.kind() == Encoding.Kind.NUMBER) {
            DoubleColumn col = table.numbers(c);
            for (int k = 0; k < kept.length; k++) {
                int r = kept[k];
                double v = col.getDouble(r);
                int at = k * width + offset;
                if (Double.isNaN(v)) {
                    x[at] = f.median();
                    imputed[partOf[r]][j]++;
                    if (f.indicator()) {
                        x[at + 1] = 1.0;
                    }
                } else {
                    x[at] = v;
                }
            }
            return;
        }
        int missingAt = f.missingLevel() ? f.levels().size() : -1;
        if (table.numeric(c)) {
            Map<Double, Integer> index = new HashMap<>();
            for (int i = 0; i < f.levels().size(); i++) {
                index.put(Double.valueOf(f.levels().get(i)) + 0.0, i);
            }
            DoubleColumn col = table.numbers(c);
            for (int k = 0; k < kept.length; k++) {
                int r = kept[k];
                double v = col.getDouble(r);
                Integer level = Double.isNaN(v) ? (missingAt >= 0 ? Integer.valueOf(missingAt) : null)
                        : index.get(v + 0.0);
                place(x, k * width + offset, level, Double.isNaN(v), partOf[r], j, imputed, unseen);
            }
        } else {
            Map<String, Integer> index = new HashMap<>();
            for (int i = 0; i < f.levels().size(); i++) {
                index.put(f.levels().get(i), i);
            }
            StringColumn col = table.texts(c);
            for (int k = 0; k < kept.length; k++) {
                int r = kept[k];
                boolean missing = col.isMissing(r);
                Integer level = missing ? (missingAt >= 0 ? Integer.valueOf(missingAt) : null) : index.get(col.get(r));
                place(x, k * width + offset, level, missing, partOf[r], j, imputed, unseen);
            }
        }
    }

    private static void place(double[] x, int at, Integer level, boolean missing, int part, int j, int[][] imputed,
            int[][] unseen) {
        if (level == null) {
            unseen[part][j]++;
            return;
        }
        x[at + level] = 1.0;
        if (missing) {
            imputed[part][j]++;
        }
    }

    // ------------------------------------------------------------------ warnings and helpers

    private static List<String> columnWarnings(SourceTable table, List<Integer> features, Set<Integer> forced) {
        List<String> out = new ArrayList<>();
        for (int c : features) {
            String name = BadInputException.shown(table.columnNames().get(c));
            SourceTable.ColumnFacts f = table.facts(c);
            int present = table.rows() - f.missing();
            if (present >= ID_WARNING_ROWS && allDistinct(table, c, present)) {
                out.add(table.name() + ": column " + name + " has a different value in every row (an ID?); if it"
                        + " is one, list it in data.drop");
            }
            if (!table.numeric(c) && !forced.contains(c) && f.numberCells() > f.textCells()) {
                out.add(table.name() + ": column " + name + " is read as text (categories) because of "
                        + BadInputException.shown(f.firstText()) + " on line " + f.firstTextLine() + ", although "
                        + f.numberCells() + " of its " + table.rows() + " cells are numbers; fix those cells, or list"
                        + " it in data.categorical to keep it categorical");
            }
        }
        return out;
    }

    /** Text columns, and number columns of whole numbers, whose present values are all different. */
    private static boolean allDistinct(SourceTable table, int c, int present) {
        if (!table.numeric(c)) {
            StringColumn col = table.texts(c);
            return col.countUnique() - (col.countMissing() > 0 ? 1 : 0) == present;
        }
        DoubleColumn col = table.numbers(c);
        double[] v = new double[present];
        int n = 0;
        for (int r = 0; r < table.rows(); r++) {
            double x = col.getDouble(r);
            if (!Double.isNaN(x)) {
                if (x != Math.rint(x)) {
                    return false; // measurements, not identifiers
                }
                v[n++] = x;
            }
        }
        Arrays.sort(v, 0, n);
        for (int i = 1; i < n; i++) {
            if (v[i] == v[i - 1]) {
                return false;
            }
        }
        return true;
    }

    /** @return the ascending union of the parts (disjoint ascending arrays) */
    private static int[] union(int[][] parts) {
        int n = 0;
        for (int[] p : parts) {
            n += p.length;
        }
        int[] all = new int[n];
        int i = 0;
        for (int[] p : parts) {
            System.arraycopy(p, 0, all, i, p.length);
            i += p.length;
        }
        Arrays.sort(all);
        for (int k = 1; k < n; k++) {
            if (all[k] == all[k - 1]) {
                throw new IllegalArgumentException("row " + all[k] + " is in two splits");
            }
        }
        return all;
    }

    /** @return the position in {@code kept} of each row of {@code part} */
    private static int[] positions(int[] kept, int[] part) {
        int[] out = new int[part.length];
        for (int i = 0; i < part.length; i++) {
            out[i] = Arrays.binarySearch(kept, part[i]);
        }
        return out;
    }
}
