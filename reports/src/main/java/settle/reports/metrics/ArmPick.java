package settle.reports.metrics;

import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence;

/**
 * The arm the verdict recommends, and why: the rule behind the first paragraph of the report's verdict section and
 * the {@code pick} of the terminal and JSON summaries.
 *
 * <p>The rule: among the arms whose returned iterate ends detectably closer to the minimum than the baseline's (on
 * the primary metric, final gap or final objective, the adjusted p and its interval agree on a reduction:
 * {@link VerdictSentence.Outcome#LOWER}), pick the one with the smallest median of the primary metric; the first in
 * arm order wins a tie. An averaged arm competes on equal terms (its returned iterate is its tail mean). An arm that
 * ends detectably farther from the minimum can never be picked. When no arm qualifies, none is picked, and the arm
 * with the smallest median over every arm (the baseline included, the first in arm order on a tie) is named.
 *
 * @param arm the picked arm (0-based), or −1 when none is picked
 * @param lowest the arm (0-based) with the smallest median of the primary metric over every arm, baseline included
 * @param reason why {@code arm} was picked, or why none was
 */
public record ArmPick(int arm, int lowest, Reason reason) {

    /** Why an arm was picked, or why none was. */
    public enum Reason {
        /** The picked arm ends detectably closer than the baseline and has the smallest median among those that do. */
        CLOSEST_OF_THE_DETECTED,
        /** No arm ends detectably closer than the baseline: none is picked. */
        NONE_DETECTED
    }

    /** @return true when an arm was picked */
    public boolean picked() {
        return arm >= 0;
    }

    /**
     * Applies the rule to the primary metric of an analysis (when the metric is unavailable no arm has a comparison
     * or a median, and none is picked).
     *
     * @param analysis the analysed study
     * @return the pick
     */
    public static ArmPick of(StudyAnalysis analysis) {
        int arms = analysis.study().armCount();
        Comparison[] byArm = new Comparison[arms];
        for (int a = 0; a < arms; a++) {
            byArm[a] = analysis.comparison(analysis.primary(), a);
        }
        return choose(byArm, analysis.medians(analysis.primary()));
    }

    /**
     * The rule itself.
     *
     * @param byArm each arm's comparison with the baseline on the primary metric, by arm index; null for the
     *     baseline (and for any arm not compared). Not modified.
     * @param medians each arm's median of the primary metric over its finished replicates, by arm index (NaN
     *     when it has none). Not modified.
     * @return the pick
     * @throws IllegalArgumentException when the arrays differ in length or are empty
     */
    public static ArmPick choose(Comparison[] byArm, double[] medians) {
        if (byArm.length != medians.length || medians.length == 0) {
            throw new IllegalArgumentException("one comparison and one median per arm: " + byArm.length
                    + " comparisons, " + medians.length + " medians");
        }
        int best = -1;
        double bestMedian = Double.POSITIVE_INFINITY;
        for (int a = 0; a < medians.length; a++) {
            if (VerdictSentence.outcome(byArm[a]) == VerdictSentence.Outcome.LOWER && medians[a] < bestMedian) {
                best = a;
                bestMedian = medians[a];
            }
        }
        int lowest = 0;
        for (int a = 1; a < medians.length; a++) {
            if (medians[a] < medians[lowest]) {
                lowest = a;
            }
        }
        return new ArmPick(best, lowest, best < 0 ? Reason.NONE_DETECTED : Reason.CLOSEST_OF_THE_DETECTED);
    }
}
