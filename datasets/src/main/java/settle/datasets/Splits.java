package settle.datasets;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import settle.input.BadInputException;

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
        if (!(fraction > 0.0 && fraction < 1.0)) {
            throw BadInputException.inFile(data.name(), "", "split fraction " + fraction
                    + " is out of range; expected a number strictly between 0 and 1");
        }
        int classes = data.classes();
        int[] counts = data.classCounts();
        int[][] members = new int[classes][];
        int[] fill = new int[classes];
        for (int k = 0; k < classes; k++) {
            members[k] = new int[counts[k]];
        }
        for (int r = 0; r < data.rows(); r++) {
            int k = data.label(r);
            members[k][fill[k]++] = r;
        }
        int[] take = new int[classes];
        int testTotal = 0;
        for (int k = 0; k < classes; k++) {
            long t = Math.round(fraction * counts[k]);
            if (t < 1 || t > counts[k] - 1) {
                throw BadInputException.inFile(data.name(), "", "class '" + data.classNames().get(k) + "' has "
                        + counts[k] + " row" + (counts[k] == 1 ? "" : "s") + ", too few to appear in both parts of a "
                        + fraction + " split; expected a class with at least one row on each side");
            }
            take[k] = (int) t;
            testTotal += take[k];
        }
        RandomGenerator random = Randomness.create(seed);
        int[] testRows = new int[testTotal];
        int[] trainRows = new int[data.rows() - testTotal];
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
        return new Split(data.subset(data.name() + " (training part)", trainRows),
                data.subset(data.name() + " (held-out part)", testRows), trainRows, testRows);
    }
}
