package settle.datasets;

import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * An immutable labelled dataset: N rows of d real features, stored row-major in one flat array,
 * and a label in {@code 0 .. K-1} per row.
 *
 * <p>Classes are numbered in the order of {@link #classNames()}, which readers fill with the distinct
 * labels in sorted order (numeric labels numerically, strings lexically). With two classes, class 1 is the
 * positive class of a sigmoid model.
 *
 * <p>The arrays are never handed out: hot loops gather rows with {@link #copyRows} into buffers they own,
 * so a dataset can be shared by any number of training threads. Null arguments are rejected with a
 * {@link NullPointerException}.
 */
public final class Dataset {

    private final String name;
    private final double[] features;
    private final int[] labels;
    private final int rows;
    private final int columns;
    private final List<String> featureNames;
    private final List<String> classNames;

    /**
     * @param name a short description of where the data came from (shown in errors and reports)
     * @param features row-major N×d values; copied, not modified
     * @param labels N labels in 0..K−1; copied, not modified
     * @param featureNames d names
     * @param classNames K names, at least two
     * @throws IllegalArgumentException when sizes disagree, a value is not finite or a label is out of range
     */
    public Dataset(String name, double[] features, int[] labels, List<String> featureNames, List<String> classNames) {
        this.name = Objects.requireNonNull(name, "name");
        this.featureNames = List.copyOf(featureNames);
        this.classNames = List.copyOf(classNames);
        this.columns = this.featureNames.size();
        this.rows = labels.length;
        if (this.classNames.size() < 2) {
            throw new IllegalArgumentException(name + ": needs at least two classes, has " + this.classNames.size());
        }
        if (columns < 1) {
            throw new IllegalArgumentException(name + ": needs at least one feature");
        }
        if (rows < 1) {
            throw new IllegalArgumentException(name + ": has no rows");
        }
        if ((long) rows * columns != features.length) {
            throw new IllegalArgumentException(name + ": " + features.length + " feature values for " + rows
                    + " rows of " + columns + " features");
        }
        this.features = features.clone();
        this.labels = labels.clone();
        for (int i = 0; i < this.features.length; i++) {
            if (!Double.isFinite(this.features[i])) {
                throw new IllegalArgumentException(name + ": row " + (i / columns + 1) + ", feature '"
                        + this.featureNames.get(i % columns) + "' is not finite: " + this.features[i]);
            }
        }
        for (int i = 0; i < rows; i++) {
            if (this.labels[i] < 0 || this.labels[i] >= this.classNames.size()) {
                throw new IllegalArgumentException(name + ": row " + (i + 1) + " has label " + this.labels[i]
                        + ", expected 0.." + (this.classNames.size() - 1));
            }
        }
    }

    /** @return where the data came from */
    public String name() {
        return name;
    }

    /** @return N, the number of rows */
    public int rows() {
        return rows;
    }

    /** @return d, the number of features per row */
    public int features() {
        return columns;
    }

    /** @return K, the number of classes */
    public int classes() {
        return classNames.size();
    }

    /** @return the d feature names, in column order */
    public List<String> featureNames() {
        return featureNames;
    }

    /** @return the K class names, class 0 first */
    public List<String> classNames() {
        return classNames;
    }

    /** @return feature {@code column} of row {@code row} (both 0-based) */
    public double feature(int row, int column) {
        Objects.checkIndex(column, columns);
        return features[row * columns + column];
    }

    /** @return the label of row {@code row} (0-based), in 0..K−1 */
    public int label(int row) {
        return labels[row];
    }

    /** @return a fresh copy of all labels */
    public int[] labels() {
        return labels.clone();
    }

    /** @return a fresh row-major copy of all features (N×d) */
    public double[] featureMatrix() {
        return features.clone();
    }

    /** @return the number of rows of each class, indexed by class */
    public int[] classCounts() {
        int[] counts = new int[classes()];
        for (int label : labels) {
            counts[label]++;
        }
        return counts;
    }

    /**
     * Gathers rows into a caller-owned row-major buffer; allocates nothing.
     *
     * @param rowIndex row indices; not modified
     * @param from the first position in {@code rowIndex} to copy
     * @param count how many rows to copy
     * @param x destination, receives {@code count × d} values from {@code xOffset}; modified
     * @param xOffset first position written in {@code x}
     * @param y destination for the labels from position 0, or null; modified
     */
    public void copyRows(int[] rowIndex, int from, int count, double[] x, int xOffset, int[] y) {
        int out = xOffset;
        for (int r = 0; r < count; r++) {
            int row = rowIndex[from + r];
            System.arraycopy(features, row * columns, x, out, columns);
            out += columns;
            if (y != null) {
                y[r] = labels[row];
            }
        }
    }

    /**
     * Gathers the contiguous rows {@code first .. first+count-1}; allocates nothing.
     *
     * @param x destination, receives {@code count × d} values from position 0; modified
     * @param y destination for the labels from position 0, or null; modified
     */
    public void copyRange(int first, int count, double[] x, int[] y) {
        System.arraycopy(features, first * columns, x, 0, count * columns);
        if (y != null) {
            System.arraycopy(labels, first, y, 0, count);
        }
    }

    /** @return the dataset holding the given rows, in that order; {@code name} describes the subset */
    public Dataset subset(String name, int[] rowIndex) {
        double[] x = new double[rowIndex.length * columns];
        int[] y = new int[rowIndex.length];
        copyRows(rowIndex, 0, rowIndex.length, x, 0, y);
        return new Dataset(name, x, y, featureNames, classNames);
    }

    @Override
    public String toString() {
        return name + " (" + rows + " rows, " + columns + " features, classes " + classNames + " with counts "
                + Arrays.toString(classCounts()) + ")";
    }
}
