package settle.reports.metrics;

import java.util.ArrayList;
import java.util.List;
import settle.reports.format.EncodingRecord;
import settle.reports.format.Replicate;
import settle.reports.format.Study;
import settle.reports.stats.ArmSummary;
import settle.reports.stats.ArmValues;
import settle.reports.stats.Comparison;
import settle.reports.stats.Direction;
import settle.reports.stats.Scale;
import settle.reports.stats.Verdict;
import settle.reports.stats.VerdictOptions;

/**
 * How each arm does on each class of the test split: per replicate, the recall of every class (the fraction of its
 * test rows whose most probable class is theirs, a tie going to the lower class index as in the test accuracy) and
 * the balanced accuracy (the mean recall over the classes that have test rows), from the replicate files' test
 * probabilities and the test labels of {@code encoding.json}. Both are compared with the baseline like the test
 * accuracy: paired by replicate, on {@link Scale#POINTS}, a diverged replicate counting as worst, the p-values and
 * intervals adjusted over the arms.
 */
public final class ClassBalance {

    /** Below this many test rows in a class, per-class figures are flagged as resting on few rows. */
    public static final int FEW_TEST_ROWS = 10;

    private final List<String> classNames;
    private final int[] testCounts;
    private final ArmSummary[] balanced;
    private final ArmSummary[][] recall;
    private final List<Comparison> balancedComparisons;
    private final List<List<Comparison>> recallComparisons;

    private ClassBalance(List<String> classNames, int[] testCounts, ArmSummary[] balanced, ArmSummary[][] recall,
            List<Comparison> balancedComparisons, List<List<Comparison>> recallComparisons) {
        this.classNames = classNames;
        this.testCounts = testCounts;
        this.balanced = balanced;
        this.recall = recall;
        this.balancedComparisons = balancedComparisons;
        this.recallComparisons = recallComparisons;
    }

    /**
     * Recall of every class.
     *
     * @param probabilities test-set class probabilities, rows × K row-major
     * @param classes K
     * @param labels the class of each row
     * @return per class, the fraction of its rows predicted as it (NaN for a class without rows)
     */
    public static double[] recall(double[] probabilities, int classes, int[] labels) {
        return recall(Replicate.predictedClasses(probabilities, classes), classes, labels);
    }

    /**
     * Recall of every class.
     *
     * @param predicted the predicted class of each row (the replicate file's, exact)
     * @param classes K
     * @param labels the class of each row
     * @return per class, the fraction of its rows predicted as it (NaN for a class without rows)
     */
    public static double[] recall(int[] predicted, int classes, int[] labels) {
        long[] hits = new long[classes];
        long[] rows = new long[classes];
        for (int i = 0; i < labels.length; i++) {
            rows[labels[i]]++;
            if (predicted[i] == labels[i]) {
                hits[labels[i]]++;
            }
        }
        double[] out = new double[classes];
        for (int c = 0; c < classes; c++) {
            out[c] = rows[c] == 0 ? Double.NaN : (double) hits[c] / rows[c];
        }
        return out;
    }

    /** @return the mean of the recalls that are defined (NaN when none is) */
    public static double balancedAccuracy(double[] recall) {
        double sum = 0;
        int n = 0;
        for (double r : recall) {
            if (!Double.isNaN(r)) {
                sum += r;
                n++;
            }
        }
        return n == 0 ? Double.NaN : sum / n;
    }

    /**
     * @param study the study
     * @param paired the replicate indices present in every arm
     * @param options the verdict's settings
     * @return the class balance, or null when the study records no test labels (written before settle did) or has
     *     no test rows
     */
    public static ClassBalance of(Study study, int[] paired, VerdictOptions options) {
        EncodingRecord e = study.encoding();
        if (e == null || e.testLabels().length == 0) {
            return null;
        }
        int[] labels = e.testLabels();
        int classes = study.manifest().classes();
        int arms = study.armCount();
        int reps = study.replicateCount();
        // per arm and replicate: K recalls then the balanced accuracy; NaN for a missing or diverged replicate
        double[][][] values = new double[arms][reps][];
        for (int a = 0; a < arms; a++) {
            for (int k = 0; k < reps; k++) {
                Replicate r = study.replicate(a, k);
                if (r != null && !r.diverged() && r.testProbabilities() != null) {
                    double[] rec = recall(r.testPredicted(), classes, labels);
                    double[] v = java.util.Arrays.copyOf(rec, classes + 1);
                    v[classes] = balancedAccuracy(rec);
                    values[a][k] = v;
                }
            }
        }
        int[] counts = new int[classes];
        for (int y : labels) {
            counts[y]++;
        }
        ArmSummary[] balanced = new ArmSummary[arms];
        ArmSummary[][] recall = new ArmSummary[arms][classes];
        for (int a = 0; a < arms; a++) {
            balanced[a] = summary(study, values, a, classes);
            for (int c = 0; c < classes; c++) {
                recall[a][c] = counts[c] == 0 ? null : summary(study, values, a, c);
            }
        }
        List<Comparison> balancedComparisons = List.of();
        List<List<Comparison>> recallComparisons = new ArrayList<>();
        int base = study.manifest().baselineIndex();
        boolean compare = arms > 1 && paired.length > 0;
        if (compare) {
            balancedComparisons = compare(study, values, classes, "balanced accuracy", base, paired, options);
        }
        for (int c = 0; c < classes; c++) {
            recallComparisons.add(compare && counts[c] > 0 ? compare(study, values, c, "recall of class "
                    + study.manifest().classNames().get(c), base, paired, options) : List.of());
        }
        return new ClassBalance(study.manifest().classNames(), counts, balanced, recall, balancedComparisons,
                recallComparisons);
    }

    private static ArmSummary summary(Study study, double[][][] values, int a, int column) {
        List<Double> v = new ArrayList<>();
        List<Boolean> d = new ArrayList<>();
        for (int k = 0; k < values[a].length; k++) {
            Replicate r = study.replicate(a, k);
            if (r == null) {
                continue;
            }
            d.add(values[a][k] == null);
            v.add(values[a][k] == null ? Double.NaN : values[a][k][column]);
        }
        double[] vv = new double[v.size()];
        boolean[] dd = new boolean[d.size()];
        for (int i = 0; i < vv.length; i++) {
            vv[i] = v.get(i);
            dd[i] = d.get(i);
        }
        return ArmSummary.of(vv, dd);
    }

    private static List<Comparison> compare(Study study, double[][][] values, int column, String metric, int base,
            int[] paired, VerdictOptions options) {
        List<ArmValues> others = new ArrayList<>();
        for (int a = 0; a < study.armCount(); a++) {
            if (a != base) {
                others.add(armValues(study, values, a, column, paired));
            }
        }
        return Verdict.compare(metric, Direction.HIGHER_IS_BETTER, Scale.POINTS,
                armValues(study, values, base, column, paired), others, options, false);
    }

    private static ArmValues armValues(Study study, double[][][] values, int a, int column, int[] paired) {
        double[] v = new double[paired.length];
        boolean[] d = new boolean[paired.length];
        for (int i = 0; i < paired.length; i++) {
            double[] row = values[a][paired[i]];
            d[i] = row == null;
            v[i] = row == null ? Double.NaN : row[column];
        }
        return new ArmValues(study.armName(a), v, d);
    }

    /** @return the class names, class 0 first */
    public List<String> classNames() {
        return classNames;
    }

    /** @return the test rows of each class */
    public int[] testCounts() {
        return testCounts.clone();
    }

    /** @return each arm's balanced accuracy over its replicates (a fraction), by arm index */
    public ArmSummary balanced(int arm) {
        return balanced[arm];
    }

    /** @return arm {@code arm}'s recall of class {@code c} over its replicates, or null when c has no test rows */
    public ArmSummary recall(int arm, int c) {
        return recall[arm][c];
    }

    /**
     * @param arm 0-based arm index
     * @param base the baseline's index
     * @return the arm's balanced-accuracy comparison with the baseline, or null for the baseline or none
     */
    public Comparison balancedComparison(int arm, int base) {
        return pick(balancedComparisons, arm, base);
    }

    /** @return the arm's recall comparison on class {@code c}, or null for the baseline or none */
    public Comparison recallComparison(int arm, int c, int base) {
        return pick(recallComparisons.get(c), arm, base);
    }

    private static Comparison pick(List<Comparison> list, int arm, int base) {
        if (arm == base || list.isEmpty()) {
            return null;
        }
        return list.get(arm < base ? arm : arm - 1);
    }

    /** @return the index of the class with the fewest test rows (the first such) */
    public int smallestClass() {
        int s = 0;
        for (int c = 1; c < testCounts.length; c++) {
            if (testCounts[c] < testCounts[s]) {
                s = c;
            }
        }
        return s;
    }

    /**
     * @return the caution when the smallest class has fewer than {@value #FEW_TEST_ROWS} test rows ("per-class
     *     figures rest on 3 test rows of class 'x'"), or "" when none is needed
     */
    public String caution() {
        int s = smallestClass();
        if (testCounts[s] >= FEW_TEST_ROWS) {
            return "";
        }
        String name = "'" + settle.reports.text.Names.shown(classNames.get(s)) + "'";
        if (testCounts[s] == 0) {
            return "class " + name + " has no test rows: its recall is not measured, and the balanced accuracy"
                    + " leaves it out";
        }
        return "per-class figures rest on " + fewRows(classNames.get(s), testCounts[s]);
    }

    /**
     * The words for a class with few test rows, shared by the report's caution and {@code settle check}'s forecast.
     *
     * @param className the class's name
     * @param rows its test rows, 1 to {@value #FEW_TEST_ROWS} − 1
     * @return e.g. "7 test rows of class 'b' (fewer than 10; its recall moves in steps of 14.3 pp)"
     */
    public static String fewRows(String className, int rows) {
        return rows + " test row" + (rows == 1 ? "" : "s") + " of class '" + settle.reports.text.Names.shown(className)
                + "' (fewer than " + FEW_TEST_ROWS + "; its recall moves in steps of "
                + Math.round(1000.0 / rows) / 10.0 + " pp)";
    }
}
