package settle.datasets;

import java.util.ArrayList;
import java.util.List;
import settle.input.BadInputException;

/**
 * A z-score fitted on one dataset (the training split) and applied to any dataset with the same features:
 * x' = (x − mean) / scale, with the mean and the population standard deviation (divisor N) of the fitting
 * data. A constant column (every value equal) gets its value as mean and scale 1, so it becomes exactly 0
 * rather than a division by zero; {@link #warnings()} says which.
 */
public final class Standardiser {

    private final double[] means;
    private final double[] scales;
    private final List<String> featureNames;
    private final List<String> warnings;

    private Standardiser(double[] means, double[] scales, List<String> featureNames, List<String> warnings) {
        this.means = means;
        this.scales = scales;
        this.featureNames = featureNames;
        this.warnings = warnings;
    }

    /**
     * Fits the means and scales on {@code training} (two passes: mean, then mean squared deviation).
     *
     * @param training the training split; not modified
     * @return the fitted standardiser
     */
    public static Standardiser fit(Dataset training) {
        int n = training.rows();
        int d = training.features();
        double[] mean = new double[d];
        double[] scale = new double[d];
        boolean[] constant = new boolean[d];
        java.util.Arrays.fill(constant, true);
        for (int r = 0; r < n; r++) {
            for (int c = 0; c < d; c++) {
                double v = training.feature(r, c);
                mean[c] += v;
                if (v != training.feature(0, c)) {
                    constant[c] = false;
                }
            }
        }
        for (int c = 0; c < d; c++) {
            mean[c] /= n;
        }
        double[] ss = new double[d];
        for (int r = 0; r < n; r++) {
            for (int c = 0; c < d; c++) {
                double e = training.feature(r, c) - mean[c];
                ss[c] += e * e;
            }
        }
        List<String> warnings = new ArrayList<>();
        for (int c = 0; c < d; c++) {
            if (constant[c]) {
                mean[c] = training.feature(0, c);
                scale[c] = 1.0;
                warnings.add(constantWarning(training.featureNames().get(c), "the training split"));
            } else {
                scale[c] = Math.sqrt(ss[c] / n);
            }
        }
        return new Standardiser(mean, scale, training.featureNames(), List.copyOf(warnings));
    }

    /**
     * @param data a dataset with the fitted features; not modified
     * @return the standardised copy (same name, labels and classes)
     * @throws BadInputException when the feature names differ from the fitted ones
     */
    public Dataset apply(Dataset data) {
        if (!data.featureNames().equals(featureNames)) {
            throw BadInputException.inFile(data.name(), "", "features " + data.featureNames()
                    + " differ from the fitted " + featureNames + "; expected the same columns");
        }
        int d = means.length;
        double[] x = data.featureMatrix();
        for (int i = 0; i < x.length; i++) {
            int c = i % d;
            x[i] = (x[i] - means[c]) / scales[c];
        }
        return new Dataset(data.name(), x, data.labels(), data.featureNames(), data.classNames());
    }

    /** @return a fresh copy of the fitted means, one per feature */
    public double[] means() {
        return means.clone();
    }

    /** @return a fresh copy of the fitted scales (population standard deviations; 1 for constant columns) */
    public double[] scales() {
        return scales.clone();
    }

    /** @return the feature names the standardiser was fitted on */
    public List<String> featureNames() {
        return featureNames;
    }

    /** @return one warning per constant column of the fitting data, in column order */
    public List<String> warnings() {
        return warnings;
    }

    /**
     * Lists the constant feature columns of any dataset (e.g. a whole file before it is split).
     *
     * @param data the dataset; not modified
     * @param where how the warning names it, e.g. "the training split" or a file name
     * @return one warning per constant column, in column order
     */
    public static List<String> constantFeatureWarnings(Dataset data, String where) {
        List<String> out = new ArrayList<>();
        for (int c = 0; c < data.features(); c++) {
            double first = data.feature(0, c);
            boolean constant = true;
            for (int r = 1; r < data.rows() && constant; r++) {
                constant = data.feature(r, c) == first;
            }
            if (constant) {
                out.add(constantWarning(data.featureNames().get(c), where));
            }
        }
        return out;
    }

    private static String constantWarning(String feature, String where) {
        return "feature '" + feature + "' is constant in " + where + "; it carries nothing after standardisation";
    }
}
