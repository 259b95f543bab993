package settle.reports.format;

import java.util.List;

/**
 * One replicate file {@code arms/<arm id>/<replicate>.json} (README, "Study directory"): what the runner writes through
 * {@link ReplicateJson#write} and the report reads through {@link ReplicateJson#read}. Arrays are not copied: treat
 * them as read-only. A number that does not apply is NaN (null in the file).
 *
 * @param armId the arm's id ({@link StudyFormat#armId}), the name of its directory
 * @param armName the arm's name
 * @param replicate replicate number, from 1
 * @param seeds its derived seeds
 * @param status "finished" or "diverged"
 * @param divergedAtUpdate the update at which it diverged (0 when it did not)
 * @param totalUpdates the planned number of updates T
 * @param updatesRun the updates actually applied (the length of {@code rates})
 * @param averageTail true for an {@code average: tail} arm
 * @param initialObjective F(θ₀)
 * @param metrics the per-replicate metrics, indexed by {@link Metric#ordinal()}
 * @param averagedObjective F(θ̄), the objective at the tail mean
 * @param tail where the tail lies, or null when the file has none (a diverged replicate)
 * @param epochs the per-epoch series
 * @param nudges the nudges in force during the replicate, in the order applied (empty when none)
 * @param plateauCuts where a plateau schedule cut its rate, in epoch order (empty when none)
 * @param rates the rate of every update run
 * @param start θ₀
 * @param last θ_T
 * @param tailMean θ̄, the mean of the tail iterates (null when the file has none)
 * @param snapshotRows K, the tail snapshots recorded (0 when none)
 * @param snapshots the gauge-free tail snapshots, K × P row-major (null when none)
 * @param testClasses columns of the test probabilities
 * @param testProbabilities test-set class probabilities, rows × K row-major (null when none); as read from a study,
 *     each rounded to float32 (README, "Study directory")
 * @param testPredicted the predicted class of each test row, the most probable in the float64 probabilities the run
 *     computed (a tie to the lower class index), kept exactly so that no float32 tie changes it (null when none)
 * @param prediction the predicted noise ball, or a skipped one
 */
public record Replicate(String armId, String armName, int replicate, Seeds seeds, String status, long divergedAtUpdate,
        long totalUpdates, long updatesRun, boolean averageTail, double initialObjective, double[] metrics,
        double averagedObjective, Tail tail, Epochs epochs, List<Nudge> nudges, List<PlateauCut> plateauCuts,
        double[] rates, double[] start, double[] last, double[] tailMean, int snapshotRows, double[] snapshots,
        int testClasses, double[] testProbabilities, int[] testPredicted, Prediction prediction) {

    /** The status of a replicate that ran to its last update. */
    public static final String FINISHED = "finished";
    /** The status of a replicate that stopped on a loss that was not finite or too large. */
    public static final String DIVERGED = "diverged";

    public Replicate {
        nudges = List.copyOf(nudges);
        plateauCuts = List.copyOf(plateauCuts);
        if (metrics.length != Metric.values().length) {
            throw new IllegalArgumentException(metrics.length + " metrics; expected " + Metric.values().length);
        }
        if ((testPredicted == null) != (testProbabilities == null) || testPredicted != null
                && (long) testPredicted.length * testClasses != testProbabilities.length) {
            throw new IllegalArgumentException("predicted classes do not match the test probabilities");
        }
    }

    /**
     * A replicate as the run computed it: the predicted test classes are those of its float64 probabilities.
     *
     * @see Replicate the parameters
     */
    public Replicate(String armId, String armName, int replicate, Seeds seeds, String status, long divergedAtUpdate,
            long totalUpdates, long updatesRun, boolean averageTail, double initialObjective, double[] metrics,
            double averagedObjective, Tail tail, Epochs epochs, List<Nudge> nudges, List<PlateauCut> plateauCuts,
            double[] rates, double[] start, double[] last, double[] tailMean, int snapshotRows, double[] snapshots,
            int testClasses, double[] testProbabilities, Prediction prediction) {
        this(armId, armName, replicate, seeds, status, divergedAtUpdate, totalUpdates, updatesRun, averageTail,
                initialObjective, metrics, averagedObjective, tail, epochs, nudges, plateauCuts, rates, start, last,
                tailMean, snapshotRows, snapshots, testClasses, testProbabilities,
                predictedClasses(testProbabilities, testClasses), prediction);
    }

    /**
     * @param probabilities rows × K row-major, or null
     * @param classes K
     * @return each row's most probable class, a tie going to the lower index (the test accuracy's rule); null for null
     */
    public static int[] predictedClasses(double[] probabilities, int classes) {
        if (probabilities == null) {
            return null;
        }
        int rows = classes == 0 ? 0 : probabilities.length / classes;
        int[] out = new int[rows];
        for (int r = 0; r < rows; r++) {
            int base = r * classes;
            int best = 0;
            for (int c = 1; c < classes; c++) {
                if (probabilities[base + c] > probabilities[base + best]) {
                    best = c;
                }
            }
            out[r] = best;
        }
        return out;
    }

    /** @return true when the replicate diverged */
    public boolean diverged() {
        return DIVERGED.equals(status);
    }

    /** @return the value of a per-replicate metric (NaN when the file has none) */
    public double metric(Metric m) {
        return metrics[m.ordinal()];
    }

    /** @return the derived seed of the initial weights */
    public long initialisationSeed() {
        return seeds.initialisation();
    }

    /** @return the derived seed of the mini-batch order */
    public long samplingSeed() {
        return seeds.sampling();
    }

    /** @return θ_F, the "final" iterate: θ̄ for an averaged arm, else θ_T */
    public double[] finalIterate() {
        return averageTail && tailMean != null ? tailMean : last;
    }

    /** @return the number of test examples with probabilities (0 when none) */
    public int testRows() {
        return testProbabilities == null || testClasses == 0 ? 0 : testProbabilities.length / testClasses;
    }

    /**
     * A replicate's derived seeds ({@code seeds}).
     *
     * @param algorithm the random generator's name
     * @param root the plan's root seed
     * @param initialisation the seed of the initial weights
     * @param sampling the seed of the mini-batch order
     */
    public record Seeds(String algorithm, long root, long initialisation, long sampling) {
    }

    /**
     * The replicate file's {@code tail}: the last L updates, over which the tail metrics are taken.
     *
     * @param firstUpdate the tail's first update (from 1)
     * @param length L, its number of updates
     * @param epochEnds the epoch ends among them
     * @param snapshots K, the snapshots taken in it
     * @param snapshotUpdates the update of each snapshot, strictly increasing, the last = T
     * @param snapshotObjectives F at each snapshot
     */
    public record Tail(long firstUpdate, long length, int epochEnds, int snapshots, long[] snapshotUpdates,
            double[] snapshotObjectives) {
    }

    /**
     * Per-epoch series of a replicate; a value that does not apply is NaN.
     *
     * @param epoch epoch numbers (1 = the first pass)
     * @param lastUpdate the last update of each epoch
     * @param rate the rate of each epoch's last update
     * @param objective the training objective at the epoch's end
     * @param holdoutLoss the holdout loss at the epoch's end (NaN without a holdout split)
     * @param testLoss test loss at the epoch's end
     * @param testAccuracy test accuracy at the epoch's end
     * @param distance ‖θ − θ*‖ at the epoch's end (convex models)
     */
    public record Epochs(double[] epoch, double[] lastUpdate, double[] rate, double[] objective,
            double[] holdoutLoss, double[] testLoss, double[] testAccuracy, double[] distance) {

        /** @return the number of epochs recorded */
        public int size() {
            return epoch.length;
        }
    }
}
