package settle.datasets;

import settle.input.BadInputException;
import java.util.Arrays;
import java.util.List;
import java.util.random.RandomGenerator;

/** Seeded stratified splits: the test split, and the holdout carved from a training split. */
public final class Splits {

    private Splits() {
    }

    /**
     * Splits {@code data} so that each class contributes {@code round(fraction · n_c)} of its {@code n_c}
     * rows (halves round up) to the second part and the rest to the first. Which rows go is decided by a
     * Fisher–Yates shuffle of each class's rows (classes in class order, one {@link Randomness} generator
     * seeded with {@code seed}): the same data, fraction and seed always give the same split.
     *
     * <p>Use it for the test split ({@code test-fraction}) and again on the training part for the holdout
     * ({@code holdout-fraction}); pass different seeds for the two (the caller derives them from the root
     * seed).
     *
     * @param data the rows to split; not modified
     * @param fraction the share of the second part, strictly between 0 and 1
     * @param seed the generator seed
     * @return the two parts with their row indices
     * @throws BadInputException when the fraction is out of range, or a class is too small to appear in both
     *         parts at this fraction (the message names the class)
     */
    public static Split stratified(Dataset data, double fraction, long seed) {
        int[][] parts = rows(data.name(), data.labels(), data.classNames(), fraction, seed);
        return new Split(data.subset(data.name() + " (training part)", parts[0]),
                data.subset(data.name() + " (held-out part)", parts[1]), parts[0], parts[1]);
    }

    /**
     * As {@link #stratified(Dataset, double, long)} from the labels alone, so that a table can be split before
     * anything about its features is fitted.
     *
     * @param name how messages name the data
     * @param labels each row's class in 0..K−1; not modified
     * @param classNames the K class names (for messages)
     * @param fraction the share of the second part, strictly between 0 and 1
     * @param seed the generator seed
     * @return the rows of the first part and of the second, each ascending
     * @throws BadInputException as {@link #stratified(Dataset, double, long)}
     */
    public static int[][] rows(String name, int[] labels, List<String> classNames, double fraction, long seed) {
        if (!(fraction > 0.0 && fraction < 1.0)) {
            throw BadInputException.of("", name + ": split fraction " + fraction
                    + " is out of range; expected a number strictly between 0 and 1");
        }
        int classes = classNames.size();
        int[] counts = new int[classes];
        for (int label : labels) {
            counts[label]++;
        }
        int[][] members = new int[classes][];
        int[] fill = new int[classes];
        for (int k = 0; k < classes; k++) {
            members[k] = new int[counts[k]];
        }
        for (int r = 0; r < labels.length; r++) {
            int k = labels[r];
            members[k][fill[k]++] = r;
        }
        int[] take = new int[classes];
        int testTotal = 0;
        for (int k = 0; k < classes; k++) {
            long t = Math.round(fraction * counts[k]);
            if (t < 1 || t > counts[k] - 1) {
                throw BadInputException.of("", name + ": class '" + classNames.get(k) + "' has "
                        + counts[k] + " row" + (counts[k] == 1 ? "" : "s") + ", too few to appear in both parts of a "
                        + fraction + " split; expected a class with at least one row on each side");
            }
            take[k] = (int) t;
            testTotal += take[k];
        }
        RandomGenerator random = Randomness.create(seed);
        int[] testRows = new int[testTotal];
        int[] trainRows = new int[labels.length - testTotal];
        int ti = 0;
        int ri = 0;
        for (int k = 0; k < classes; k++) {
            int[] m = members[k];
            for (int i = m.length - 1; i > 0; i--) {
                int j = random.nextInt(i + 1);
                int s = m[i];
                m[i] = m[j];
                m[j] = s;
            }
            for (int i = 0; i < m.length; i++) {
                if (i < take[k]) {
                    testRows[ti++] = m[i];
                } else {
                    trainRows[ri++] = m[i];
                }
            }
        }
        Arrays.sort(testRows);
        Arrays.sort(trainRows);
        return new int[][] {trainRows, testRows};
    }

    /**
     * The three parts a study trains and judges on: the test split carved from every row, then the holdout carved
     * from the rest; each by {@link #rows}, with the rule's seeds.
     *
     * @param name how messages name the data
     * @param labels each row's class; not modified
     * @param classNames the class names
     * @param rule the fractions and seeds
     * @return training, holdout and test rows, each ascending (holdout or test empty when its fraction is 0)
     * @throws BadInputException keyed {@code test-fraction} or {@code holdout-fraction} when a split cannot be made
     */
    public static int[][] parts(String name, int[] labels, List<String> classNames, SplitRule rule) {
        int[] train = new int[labels.length];
        for (int r = 0; r < train.length; r++) {
            train[r] = r;
        }
        int[] test = new int[0];
        if (rule.testFraction() > 0) {
            try {
                int[][] t = rows(name, labels, classNames, rule.testFraction(), rule.testSeed());
                train = t[0];
                test = t[1];
            } catch (BadInputException e) {
                throw BadInputException.of("data.test-fraction", e.getMessage());
            }
        }
        int[] holdout = new int[0];
        if (rule.holdoutFraction() > 0) {
            int[] trainLabels = new int[train.length];
            for (int i = 0; i < train.length; i++) {
                trainLabels[i] = labels[train[i]];
            }
            int[][] h;
            try {
                h = rows(name + (rule.testFraction() > 0 ? " (training part)" : ""), trainLabels, classNames,
                        rule.holdoutFraction(), rule.holdoutSeed());
            } catch (BadInputException e) {
                throw BadInputException.of("data.holdout-fraction", e.getMessage());
            }
            int[] rest = new int[h[0].length];
            for (int i = 0; i < rest.length; i++) {
                rest[i] = train[h[0][i]];
            }
            holdout = new int[h[1].length];
            for (int i = 0; i < holdout.length; i++) {
                holdout[i] = train[h[1][i]];
            }
            train = rest;
        }
        return new int[][] {train, holdout, test};
    }
}
