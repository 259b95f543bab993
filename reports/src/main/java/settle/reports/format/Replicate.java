package settle.reports.format;

/**
 * One replicate file {@code arms/<arm>/<replicate>.json}. Arrays are not copied: treat them as read-only.
 *
 * @param arm arm index, from 1
 * @param armName the arm's name
 * @param replicate replicate number, from 1
 * @param initialisationSeed the derived seed of the initial weights
 * @param samplingSeed the derived seed of the mini-batch order
 * @param status "finished" or "diverged"
 * @param divergedAtUpdate the update at which it diverged (0 when it did not)
 * @param totalUpdates the planned number of updates
 * @param averageTail true for an {@code average: tail} arm
 * @param initialObjective F(θ₀)
 * @param tail where the tail lies, or null when the file has none (a diverged replicate)
 * @param metrics the per-replicate metrics, indexed by {@link Metric#ordinal()}; NaN where the file has null
 * @param epochs the per-epoch series
 * @param rates the rate of every update run
 * @param last θ_T
 * @param tailMean θ̄, the mean of the tail iterates (null when the file has none)
 * @param snapshotRows K, the tail snapshots recorded (0 when none)
 * @param snapshots the tail snapshots, K × P row-major (null when none)
 * @param testClasses columns of the test probabilities
 * @param testProbabilities test-set class probabilities, rows × K row-major (null when none)
 * @param prediction the predicted noise ball, or a skipped one
 * @param nudges the nudges in force during the replicate, in the order applied (empty when none)
 * @param plateauCuts where a plateau schedule cut its rate, in epoch order (empty when none)
 */
public record Replicate(int arm, String armName, int replicate, long initialisationSeed, long samplingSeed,
        String status, long divergedAtUpdate, long totalUpdates, boolean averageTail, double initialObjective,
        Tail tail, double[] metrics, Epochs epochs, double[] rates, double[] last, double[] tailMean, int snapshotRows,
        double[] snapshots, int testClasses, double[] testProbabilities, Prediction prediction,
        java.util.List<Nudge> nudges, java.util.List<PlateauCut> plateauCuts) {

    public Replicate {
        nudges = java.util.List.copyOf(nudges);
        plateauCuts = java.util.List.copyOf(plateauCuts);
    }

    /** @return true when the replicate diverged */
    public boolean diverged() {
        return "diverged".equals(status);
    }

    /** @return the value of a per-replicate metric (NaN when the file has none) */
    public double metric(Metric m) {
        return metrics[m.ordinal()];
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
     * The replicate file's {@code tail}: the last L updates, over which the tail metrics are taken.
     *
     * @param firstUpdate the tail's first update (from 1)
     * @param length L, its number of updates
     * @param epochEnds the epoch ends among them (−1 when the file does not record it)
     * @param snapshots K, the snapshots taken in it
     */
    public record Tail(long firstUpdate, long length, int epochEnds, int snapshots) {
    }

    /**
     * Per-epoch series of a replicate; a value that does not apply is NaN.
     *
     * @param epoch epoch numbers (1 = the first pass)
     * @param lastUpdate the last update of each epoch
     * @param rate the rate of each epoch's last update
     * @param objective the training objective at the epoch's end
     * @param testLoss test loss at the epoch's end
     * @param testAccuracy test accuracy at the epoch's end
     * @param distance ‖θ − θ*‖ at the epoch's end (convex models)
     */
    public record Epochs(double[] epoch, double[] lastUpdate, double[] rate, double[] objective, double[] testLoss,
            double[] testAccuracy, double[] distance) {

        /** @return the number of epochs recorded */
        public int size() {
            return epoch.length;
        }
    }
}
