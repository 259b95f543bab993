package settle.experiments.plan;

import java.util.ArrayList;
import java.util.List;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.Split;
import settle.datasets.Splits;
import settle.datasets.Standardiser;
import settle.engine.schedule.RunShape;
import settle.input.BadInputException;

/**
 * A plan's data, loaded and split the one way every command does it: the test split is carved from all rows
 * (stratified, seeded by {@link #testSplitSeed}), the holdout from the rest (seeded by
 * {@link #holdoutSplitSeed}), the remaining rows form the training split, and the standardiser (when the
 * plan asks for one) is fitted on the training split only and applied to all three.
 */
public final class PlanData {

    private final Dataset all;
    private final Dataset train;
    private final Dataset holdout;
    private final Dataset test;
    private final Standardiser standardiser;
    private final List<String> warnings;

    private PlanData(Dataset all, Dataset train, Dataset holdout, Dataset test, Standardiser standardiser,
            List<String> warnings) {
        this.all = all;
        this.train = train;
        this.holdout = holdout;
        this.test = test;
        this.standardiser = standardiser;
        this.warnings = List.copyOf(warnings);
    }

    /**
     * The seed of the test split: SplitMix64's finaliser applied to the root seed plus 1 · the golden-ratio
     * increment (Steele, Lea &amp; Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014), so
     * that it depends on the root seed only.
     *
     * @return the seed of the stratified test split
     */
    public static long testSplitSeed(long rootSeed) {
        return mix(rootSeed + 0x9E3779B97F4A7C15L);
    }

    /** @return the seed of the stratified holdout split: as {@link #testSplitSeed} with 2 increments */
    public static long holdoutSplitSeed(long rootSeed) {
        return mix(rootSeed + 2 * 0x9E3779B97F4A7C15L);
    }

    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /**
     * Loads and splits a plan's data.
     *
     * @param parsed the plan with its key positions
     * @return the splits
     * @throws BadInputException positioned at {@code data.source} when the data cannot be read, or at the
     *         fraction whose split cannot be made
     */
    public static PlanData load(ParsedPlan parsed) {
        DataPlan d = parsed.plan().data();
        Dataset all;
        try {
            all = DataSources.load(d.source(), d.label(), null);
        } catch (BadInputException e) {
            throw parsed.error(d.label() != null && e.getMessage() != null && e.getMessage().contains("label")
                    ? "data.label" : "data.source", e.getMessage());
        }
        return split(parsed, all);
    }

    /**
     * Splits (and standardises) rows already read, exactly as {@link #load} does after reading them: a cluster
     * worker that receives the rows from the driver gets the same splits without reading the source again.
     *
     * @param parsed the plan with its key positions
     * @param all every row of the plan's data source, as read; not modified
     * @return the splits
     * @throws BadInputException positioned at the fraction whose split cannot be made
     */
    public static PlanData split(ParsedPlan parsed, Dataset all) {
        Plan plan = parsed.plan();
        DataPlan d = plan.data();
        Split testSplit;
        try {
            testSplit = Splits.stratified(all, d.testFraction(), testSplitSeed(plan.seed()));
        } catch (BadInputException e) {
            throw parsed.error("data.test-fraction", e.getMessage());
        }
        Dataset train = testSplit.train();
        Dataset holdout = null;
        if (d.holdoutFraction() > 0) {
            Split h;
            try {
                h = Splits.stratified(train, d.holdoutFraction(), holdoutSplitSeed(plan.seed()));
            } catch (BadInputException e) {
                throw parsed.error("data.holdout-fraction", e.getMessage());
            }
            train = h.train();
            holdout = h.test();
        }
        Dataset test = testSplit.test();
        Standardiser standardiser = null;
        List<String> warnings = new ArrayList<>();
        if (d.standardize()) {
            standardiser = Standardiser.fit(train);
            warnings.addAll(standardiser.warnings());
            train = standardiser.apply(train);
            test = standardiser.apply(test);
            holdout = holdout == null ? null : standardiser.apply(holdout);
        }
        return new PlanData(all, train, holdout, test, standardiser, warnings);
    }

    /** @return every row, as read */
    public Dataset all() {
        return all;
    }

    /** @return the training split (standardised when the plan says so) */
    public Dataset train() {
        return train;
    }

    /** @return the holdout split, or null when {@code holdout-fraction} is 0 */
    public Dataset holdout() {
        return holdout;
    }

    /** @return the test split */
    public Dataset test() {
        return test;
    }

    /** @return the standardiser fitted on the training split, or null when the plan does not standardise */
    public Standardiser standardiser() {
        return standardiser;
    }

    /** @return warnings about the data (constant columns), one line each */
    public List<String> warnings() {
        return warnings;
    }

    /** @return ⌈N_train / B⌉, the updates of one epoch (for both sampling modes) */
    public int updatesPerEpoch(int batch) {
        return (train.rows() + batch - 1) / batch;
    }

    /** @return the run shape every arm of {@code plan} shares */
    public RunShape shape(Plan plan) {
        return new RunShape(plan.training().epochs(), updatesPerEpoch(plan.training().batch()));
    }
}
