package settle.datasets.bundled;

import java.util.List;

/**
 * One entry of the bundled-data registry: what the resource holds and where it came from.
 *
 * @param name the name after {@code bundled:}
 * @param title the dataset's full name at its source
 * @param resource the class-path resource holding it (CSV, header row, label column last)
 * @param table true for a table with text columns or gaps, read through the table path
 *        ({@link settle.datasets.table.TableReader}, so the plan's {@code data.*} column keys apply); false for an
 *        all-numeric file without gaps, read by {@link settle.datasets.io.CsvReader}
 * @param sha256 the SHA-256 of the resource's bytes, lower-case hex; verified on every load
 * @param labelColumn the label column's name
 * @param rows N
 * @param features the input columns before encoding (d, for an all-numeric file)
 * @param classNames the classes in settle's order (sorted labels)
 * @param classCounts rows per class, in that order
 * @param source where the copy was taken from
 * @param licence the licence of the data
 * @param credit the creators to credit
 * @param citation the original citation (and the repository's DOI)
 */
public record BundledDataset(String name, String title, String resource, boolean table, String sha256,
        String labelColumn, int rows,
        int features, List<String> classNames, List<Integer> classCounts, String source, String licence, String credit,
        String citation) {

    /** Copies the lists and checks that counts and classes agree. */
    public BundledDataset {
        classNames = List.copyOf(classNames);
        classCounts = List.copyOf(classCounts);
        if (classNames.size() != classCounts.size()) {
            throw new IllegalArgumentException(name + ": " + classNames.size() + " classes, " + classCounts.size()
                    + " counts");
        }
        int sum = 0;
        for (int c : classCounts) {
            sum += c;
        }
        if (sum != rows) {
            throw new IllegalArgumentException(name + ": class counts sum to " + sum + ", not " + rows);
        }
    }

    /** @return e.g. {@code benign 357, malignant 212} */
    public String classSummary() {
        StringBuilder b = new StringBuilder();
        for (int k = 0; k < classNames.size(); k++) {
            if (k > 0) {
                b.append(", ");
            }
            b.append(classNames.get(k)).append(' ').append(classCounts.get(k));
        }
        return b.toString();
    }
}
