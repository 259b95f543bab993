package settle.experiments.plan;

import java.util.ArrayList;
import java.util.List;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.PreparedData;
import settle.datasets.Randomness;
import settle.datasets.SplitRule;
import settle.datasets.Standardiser;
import settle.datasets.table.TableReport;
import settle.engine.schedule.RunShape;
import settle.input.BadInputException;

/**
 * A plan's data, loaded and split the one way every command does it: the test split is carved from all rows
 * (stratified, seeded by {@link #testSplitSeed}), the holdout from the rest (seeded by
 * {@link #holdoutSplitSeed}), the remaining rows form the training split; a CSV table is then encoded with what
 * is fitted on the training split alone (its {@code data} table keys), and the standardiser (when the plan asks
 * for one) is fitted on the training split only and applied to all three.
 */
public final class PlanData {

    private final Dataset all;
    private final Dataset train;
    private final Dataset holdout;
    private final Dataset test;
    private final Standardiser standardiser;
    private final List<String> warnings;
    private final PreparedData prepared;

    private PlanData(Dataset all, Dataset train, Dataset holdout, Dataset test, Standardiser standardiser,
            List<String> warnings, PreparedData prepared) {
        this.prepared = prepared;
        this.all = all;
        this.train = train;
        this.holdout = holdout;
        this.test = test;
        this.standardiser = standardiser;
        this.warnings = List.copyOf(warnings);
    }

    /**
     * The seed of the test split: the first output of {@link Randomness.SplitMix64} seeded with the root seed, so
     * that it depends on the root seed only.
     *
     * @return the seed of the stratified test split
     */
    public static long testSplitSeed(long rootSeed) {
        return new Randomness.SplitMix64(rootSeed).nextLong();
    }

    /** @return the seed of the stratified holdout split: the second output of the generator of {@link #testSplitSeed} */
    public static long holdoutSplitSeed(long rootSeed) {
        Randomness.SplitMix64 random = new Randomness.SplitMix64(rootSeed);
        random.nextLong();
        return random.nextLong();
    }

    /**
     * Loads, encodes and splits a plan's data ({@link DataSources#prepare}).
     *
     * @param parsed the plan with its key positions
     * @return the splits
     * @throws BadInputException positioned at {@code data.source} when the data cannot be read, at the {@code data} key
     *         that causes or can fix a problem ({@code data.missing}, {@code data.features}, …), or at the fraction
     *         whose split cannot be made
     */
    public static PlanData load(ParsedPlan parsed) {
        Plan plan = parsed.plan();
        DataPlan d = plan.data();
        PreparedData prepared;
        try {
            prepared = DataSources.prepare(d.source(), d.label(), d.table(), null, new SplitRule(d.testFraction(),
                    testSplitSeed(plan.seed()), d.holdoutFraction(), holdoutSplitSeed(plan.seed())));
        } catch (BadInputException e) {
            // a problem a data key causes or can fix comes keyed data.KEY; any other points at the source
            String key = e.file().isEmpty() && e.key().startsWith("data.") ? e.key()
                    : d.label() != null && e.getMessage() != null && e.getMessage().contains("label") ? "data.label"
                    : "data.source";
            throw parsed.error(key, e.getMessage());
        }
        return of(parsed, prepared);
    }

    /**
     * Builds the splits (standardised when the plan says so) from rows already read and the parts already chosen,
     * exactly as {@link #load} does after reading them: a cluster worker that receives the rows and parts from the
     * driver gets the same splits without reading the source again.
     *
     * @param parsed the plan with its key positions
     * @param prepared every kept row and which of them form each split; not modified
     * @return the splits
     */
    public static PlanData of(ParsedPlan parsed, PreparedData prepared) {
        Plan plan = parsed.plan();
        Dataset all = prepared.all();
        String name = all.name();
        String trainName = prepared.test().length > 0 ? name + " (training part)" : name;
        Dataset train = all.subset(prepared.holdout().length > 0 ? trainName + " (training part)" : trainName,
                prepared.train());
        Dataset holdout = prepared.holdout().length == 0 ? null
                : all.subset(trainName + " (held-out part)", prepared.holdout());
        Dataset test = prepared.test().length == 0 ? null : all.subset(name + " (held-out part)", prepared.test());
        Standardiser standardiser = null;
        List<String> warnings = new ArrayList<>(prepared.warnings());
        if (plan.data().standardize()) {
            standardiser = Standardiser.fit(train);
            warnings.addAll(standardiser.warnings());
            train = standardiser.apply(train);
            test = test == null ? null : standardiser.apply(test);
            holdout = holdout == null ? null : standardiser.apply(holdout);
        }
        return new PlanData(all, train, holdout, test, standardiser, warnings, prepared);
    }

    /** @return every kept row, as read (a CSV table: encoded; with {@code drop-rows}, without the dropped rows) */
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

    /** @return the test split; null only for the plan trace builds with no test split (a plan file always has one) */
    public Dataset test() {
        return test;
    }

    /** @return the standardiser fitted on the training split, or null when the plan does not standardise */
    public Standardiser standardiser() {
        return standardiser;
    }

    /** @return which rows of {@link #all} form each split, and for a CSV table what became of its columns */
    public PreparedData prepared() {
        return prepared;
    }

    /** @return what became of a CSV table's columns and splits, or null for other sources */
    public TableReport table() {
        return prepared.table();
    }

    /** @return warnings about the data (constant columns, likely IDs, dropped rows, unseen values), one line each */
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
