package settle.datasets;

/**
 * Which parts a dataset is split into: a stratified test split of {@code testFraction} of every row, then a
 * stratified holdout of {@code holdoutFraction} of the rest; a fraction of 0 makes no such part.
 *
 * @param testFraction in [0, 1)
 * @param testSeed the test split's seed
 * @param holdoutFraction in [0, 1)
 * @param holdoutSeed the holdout's seed
 */
public record SplitRule(double testFraction, long testSeed, double holdoutFraction, long holdoutSeed) {

    /** Every row trains. */
    public static final SplitRule NONE = new SplitRule(0, 0, 0, 0);

    /** Checks the fractions. */
    public SplitRule {
        if (!(testFraction >= 0 && testFraction < 1) || !(holdoutFraction >= 0 && holdoutFraction < 1)) {
            throw new IllegalArgumentException("split fractions must be in [0, 1): " + testFraction + ", "
                    + holdoutFraction);
        }
    }
}
